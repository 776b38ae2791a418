// Registers every Sequelize model on one connection and wires associations in one place.
import type { Sequelize } from 'sequelize';
import { initUserModels, PasswordReset, User, UserRole } from './modules/users/user.model';
import { initTicketModels, Ticket, TicketEvent } from './modules/tickets/ticket.model';
import { initOutboxModel } from './modules/outbox/outbox.model';
import { initClubSettingsModel } from './modules/club/club-settings.model';
import { initBenchModels } from './modules/benches/bench.model';
import { initBookingModels } from './modules/bookings/booking.model';
import { initRepairModels, RepairPart, RepairWork } from './modules/repair/repair.model';
import { initTestSheetModels, TestSheetRow } from './modules/test-sheets/test-sheet.model';
import { HandBack, initHandBackModel } from './modules/hand-back/hand-back.model';
import { Diagnosis, initDiagnosisModels, ReflashConsent } from './modules/diagnosis/diagnosis.model';
import { initQuoteModels, Quote, QuoteLineRow } from './modules/quotes/quote.model';
import { initOwnerLinkModel } from './modules/owner-links/owner-link.model';
import { Charge, initPaymentModels, Payment, Refund, Waiver } from './modules/payments/payments.model';
import { initPhotoModel, Photo } from './modules/intake/photo.model';

export function initModels(sequelize: Sequelize): void {
  initUserModels(sequelize);
  initTicketModels(sequelize);
  initOutboxModel(sequelize);
  initClubSettingsModel(sequelize);
  initBenchModels(sequelize);
  initBookingModels(sequelize);
  initRepairModels(sequelize);
  initTestSheetModels(sequelize);
  initHandBackModel(sequelize);
  initDiagnosisModels(sequelize);
  initQuoteModels(sequelize);
  initOwnerLinkModel(sequelize);
  initPaymentModels(sequelize);
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
  RepairWork.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  RepairPart.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  TestSheetRow.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  HandBack.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' });
  Diagnosis.belongsTo(User, { as: 'editor', foreignKey: 'updatedBy' });
  ReflashConsent.belongsTo(User, { as: 'recorder', foreignKey: 'recordedBy' });
  Quote.hasMany(QuoteLineRow, { as: 'lines', foreignKey: 'quoteId' });
  Quote.belongsTo(User, { as: 'author', foreignKey: 'createdBy' });
  Waiver.belongsTo(Charge, { as: 'charge', foreignKey: 'chargeId' });
  Refund.belongsTo(Payment, { as: 'payment', foreignKey: 'paymentId' });
  Photo.belongsTo(User, { as: 'uploader', foreignKey: 'uploadedBy' });
}
