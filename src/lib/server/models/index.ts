import type { Sequelize } from "sequelize";
import { initAuditModels } from "./audit";
import { initAuthModels } from "./auth";
import { initBillingModels } from "./billing";
import { initLedgerModels } from "./ledger";
import { initOrganisationModels } from "./organisation";
import { initPreparationModels } from "./preparation";
import { initWasteModels } from "./waste";

/** Binds every model class to one Sequelize instance. */
export function initModels(sequelize: Sequelize) {
  initOrganisationModels(sequelize);
  initAuthModels(sequelize);
  initAuditModels(sequelize);
  initBillingModels(sequelize);
  initPreparationModels(sequelize);
  initLedgerModels(sequelize);
  initWasteModels(sequelize);
}
