import type { QueryInterface, Sequelize } from "sequelize";
import { SequelizeStorage, Umzug, type RunnableMigration } from "umzug";
import * as coreTables from "./migrations/2026.12.01T00.00.00.create-core-tables";
import * as ledgerAppendOnly from "./migrations/2026.12.01T00.01.00.ledger-append-only";
import * as preparation from "./migrations/2026.12.01T02.00.00.preparation";
import * as ledgerDetails from "./migrations/2026.12.01T03.00.00.ledger-details";
import * as billingDetails from "./migrations/2026.12.01T04.00.00.billing-details";
import * as wasteRules from "./migrations/2026.12.01T05.00.00.waste-rules";
import * as auditLogAppendOnly from "./migrations/2026.12.01T06.10.00.audit-log-append-only";
import * as ledgerDaily from "./migrations/2026.12.01T09.00.00.ledger-daily";
import * as ledgerSourceIndex from "./migrations/2026.12.01T09.10.00.ledger-source-index";
import * as batchRoom from "./migrations/2026.12.01T11.00.00.batch-room";
import * as dropLedgerSourceKindIndex from "./migrations/2026.12.02T03.00.00.drop-ledger-source-kind-index";
import * as idempotencyKeyScope from "./migrations/2026.12.04T02.00.00.idempotency-key-scope";
import * as planning from "./migrations/2026.12.04T05.00.00.planning";
import * as lotAssay from "./migrations/2026.12.04T04.00.00.lot-assay";
import * as signInSecurity from "./migrations/2026.12.04T03.00.00.sign-in-security";
import * as ledgerDailyLocalDays from "./migrations/2026.12.04T08.00.00.ledger-daily-local-days";
import * as invoiceDocuments from "./migrations/2026.12.04T07.00.00.invoice-documents";
import * as listPagingIndexes from "./migrations/2026.12.04T09.00.00.list-paging-indexes";
import * as batchExpiryBasis from "./migrations/2026.12.04T06.00.00.batch-expiry-basis";
import * as bottleUndo from "./migrations/2026.12.04T06.01.00.bottle-undo";
import * as demoFacility from "./seeders/2026.12.01T00.00.00.demo-facility";
import * as demoPreparation from "./seeders/2026.12.01T02.00.00.demo-preparation";
import * as wasteDemo from "./seeders/2026.12.01T05.00.00.waste-demo";
import * as demoBatchRooms from "./seeders/2026.12.01T11.00.00.demo-batch-rooms";
import * as demoSupply from "./seeders/2026.12.04T05.10.00.demo-supply";
import * as demoLotAssays from "./seeders/2026.12.04T04.10.00.demo-lot-assays";
import * as demoFacilityZone from "./seeders/2026.12.04T08.00.00.demo-facility-zone";
import * as demoInvoiceDetails from "./seeders/2026.12.04T07.10.00.demo-invoice-details";
import * as demoYear from "./dev-seeders/2026.12.04T10.00.00.demo-year";

interface MigrationModule {
  up: RunnableMigration<QueryInterface>["up"];
  down?: RunnableMigration<QueryInterface>["down"];
}

// Listed by import rather than found by glob, so the same list runs under tsx, Vitest and the
// app bundle. tests/unit/migrations.test.ts fails when a file in the folder is missing here.
export const MIGRATIONS: Record<string, MigrationModule> = {
  "2026.12.01T00.00.00.create-core-tables.ts": coreTables,
  "2026.12.01T00.01.00.ledger-append-only.ts": ledgerAppendOnly,
  "2026.12.01T02.00.00.preparation.ts": preparation,
  "2026.12.01T03.00.00.ledger-details.ts": ledgerDetails,
  "2026.12.01T04.00.00.billing-details.ts": billingDetails,
  "2026.12.01T05.00.00.waste-rules.ts": wasteRules,
  "2026.12.01T06.10.00.audit-log-append-only.ts": auditLogAppendOnly,
  "2026.12.01T09.00.00.ledger-daily.ts": ledgerDaily,
  "2026.12.01T09.10.00.ledger-source-index.ts": ledgerSourceIndex,
  "2026.12.01T11.00.00.batch-room.ts": batchRoom,
  "2026.12.02T03.00.00.drop-ledger-source-kind-index.ts": dropLedgerSourceKindIndex,
  "2026.12.04T02.00.00.idempotency-key-scope.ts": idempotencyKeyScope,
  "2026.12.04T05.00.00.planning.ts": planning,
  "2026.12.04T04.00.00.lot-assay.ts": lotAssay,
  "2026.12.04T03.00.00.sign-in-security.ts": signInSecurity,
  "2026.12.04T08.00.00.ledger-daily-local-days.ts": ledgerDailyLocalDays,
  "2026.12.04T07.00.00.invoice-documents.ts": invoiceDocuments,
  "2026.12.04T09.00.00.list-paging-indexes.ts": listPagingIndexes,
  "2026.12.04T06.00.00.batch-expiry-basis.ts": batchExpiryBasis,
  "2026.12.04T06.01.00.bottle-undo.ts": bottleUndo,
};

export const SEEDERS: Record<string, MigrationModule> = {
  "2026.12.01T00.00.00.demo-facility.ts": demoFacility,
  "2026.12.01T02.00.00.demo-preparation.ts": demoPreparation,
  "2026.12.01T05.00.00.waste-demo.ts": wasteDemo,
  "2026.12.01T11.00.00.demo-batch-rooms.ts": demoBatchRooms,
  "2026.12.04T05.10.00.demo-supply.ts": demoSupply,
  "2026.12.04T04.10.00.demo-lot-assays.ts": demoLotAssays,
  "2026.12.04T08.00.00.demo-facility-zone.ts": demoFacilityZone,
  "2026.12.04T07.10.00.demo-invoice-details.ts": demoInvoiceDetails,
};

// The development profile's demo year, on top of SEEDERS (which the tests read); never in the test profile.
export const DEV_SEEDERS: Record<string, MigrationModule> = {
  "2026.12.04T10.00.00.demo-year.ts": demoYear,
};

function umzugFor(sequelize: Sequelize, modules: Record<string, MigrationModule>, tableName: string) {
  return new Umzug<QueryInterface>({
    migrations: Object.entries(modules)
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([name, module]) => ({ name, up: module.up, down: module.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName }),
    logger: undefined,
  });
}

export const migrator = (sequelize: Sequelize) => umzugFor(sequelize, MIGRATIONS, "schema_migrations");
// Seeders are tracked like migrations, so the demo data is loaded once and a restart keeps user changes.
// `{ year: true }` (the development profile) adds the demo year.
export const seeder = (sequelize: Sequelize, options: { year?: boolean } = {}) =>
  umzugFor(sequelize, options.year ? { ...SEEDERS, ...DEV_SEEDERS } : SEEDERS, "schema_seeders");
