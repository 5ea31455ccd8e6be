import type { Sequelize } from "sequelize";
import { initAuditModels } from "./audit";
import { initAuthModels } from "./auth";
import { initOrganisationModels } from "./organisation";
import { initPreparationModels } from "./preparation";

/** Binds every model class to one Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  initOrganisationModels(sequelize);
  initAuthModels(sequelize);
  initAuditModels(sequelize);
  initPreparationModels(sequelize);
}
