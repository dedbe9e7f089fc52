import type { Sequelize } from 'sequelize';
import { UserModel } from '../features/people/user.model.js';

/** Register every feature's model on the instance, then wire associations once all exist. */
export function initModels(sequelize: Sequelize): void {
  UserModel.initModel(sequelize);
}
