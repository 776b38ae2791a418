// Registers every Sequelize model on one connection and wires associations in one place.
import type { Sequelize } from 'sequelize';
import { initUserModels, PasswordReset, User, UserRole } from './modules/users/user.model';
import { initTicketModels, Ticket, TicketEvent } from './modules/tickets/ticket.model';
import { initOutboxModel } from './modules/outbox/outbox.model';
import { initClubSettingsModel } from './modules/club/club-settings.model';
import { initBenchModels } from './modules/benches/bench.model';
import { initBookingModels } from './modules/bookings/booking.model';
import { initPhotoModel, Photo } from './modules/intake/photo.model';

export function initModels(sequelize: Sequelize): void {
  initUserModels(sequelize);
  initTicketModels(sequelize);
  initOutboxModel(sequelize);
  initClubSettingsModel(sequelize);
  initBenchModels(sequelize);
  initBookingModels(sequelize);
  initPhotoModel(sequelize);

  User.hasMany(UserRole, { as: 'roleRows', foreignKey: 'userId' });
  UserRole.belongsTo(User, { foreignKey: 'userId' });
  User.hasMany(PasswordReset, { foreignKey: 'userId' });
  PasswordReset.belongsTo(User, { foreignKey: 'userId' });
  Ticket.belongsTo(User, { as: 'owner', foreignKey: 'ownerUserId' });
  Ticket.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  Ticket.hasMany(TicketEvent, { as: 'events', foreignKey: 'ticketId' });
  TicketEvent.belongsTo(Ticket, { foreignKey: 'ticketId' });
  TicketEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId' });
  Photo.belongsTo(User, { as: 'uploader', foreignKey: 'uploadedBy' });
}
