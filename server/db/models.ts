import type { Sequelize } from 'sequelize';
import { FeedModel } from '../features/feeds/feed.model.js';
import { BookingModel } from '../features/bookings/booking.model.js';
import { InstrumentModel, QualificationModel } from '../features/instruments/instrument.model.js';
import { PartModel } from '../features/parts/part.model.js';
import { SetupModel } from '../features/setups/setup.model.js';
import { UserModel } from '../features/people/user.model.js';
import { UserTokenModel } from '../features/people/user-token.model.js';
import { PhotoModel } from '../features/photos/photo.model.js';
import { OutboxModel } from '../features/mail/mail.model.js';

/** Register every feature's model on the instance, then wire associations once all exist. */
export function initModels(sequelize: Sequelize): void {
  UserModel.initModel(sequelize);
  UserTokenModel.initModel(sequelize);
  InstrumentModel.initModel(sequelize);
  QualificationModel.initModel(sequelize);
  PartModel.initModel(sequelize);
  BookingModel.initModel(sequelize);
  SetupModel.initModel(sequelize);
  PhotoModel.initModel(sequelize);
  FeedModel.initModel(sequelize);
  OutboxModel.initModel(sequelize);
  // The photos service reads the uploader's name through `owner`, without importing the user model.
  PhotoModel.belongsTo(UserModel, { as: 'owner', foreignKey: 'ownerId' });
}
