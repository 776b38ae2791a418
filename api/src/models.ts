// Registers every Sequelize model on one connection and wires associations in one place.
import type { Sequelize } from 'sequelize';
import { initUserModels, User } from './modules/users/user.model';
import { initTicketModels, Ticket, TicketEvent } from './modules/tickets/ticket.model';
import { initOutboxModel } from './modules/outbox/outbox.model';
import { initBenchModels } from './modules/benches/bench.model';
import { initBookingModels } from './modules/bookings/booking.model';

export function initModels(sequelize: Sequelize): void {
  initUserModels(sequelize);
  initTicketModels(sequelize);
  initOutboxModel(sequelize);
  initBenchModels(sequelize);
  initBookingModels(sequelize);

  Ticket.belongsTo(User, { as: 'owner', foreignKey: 'ownerUserId' });
  Ticket.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  Ticket.hasMany(TicketEvent, { as: 'events', foreignKey: 'ticketId' });
  TicketEvent.belongsTo(Ticket, { foreignKey: 'ticketId' });
  TicketEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId' });
}
