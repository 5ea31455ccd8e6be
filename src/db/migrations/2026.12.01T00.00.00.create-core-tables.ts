import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const bigId = { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true };
const fk = (table: string, options: { allowNull?: boolean; onDelete?: string } = {}) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: options.allowNull ?? false,
  references: { model: table, key: "id" },
  onDelete: options.onDelete ?? (options.allowNull ? "SET NULL" : "RESTRICT"),
  onUpdate: "CASCADE",
});
const timestamps = {
  created_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
  updated_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
};
const volume = (allowNull = false) => ({ type: DataTypes.DECIMAL(14, 4), allowNull });
const ROLES = ["technician", "manager", "safety", "client", "admin"];

/** Every table the product needs as far as it can be foreseen; later features add migrations. */
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.createTable("clients", {
    id,
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    kind: { type: DataTypes.ENUM("internal", "external"), allowNull: false },
    cost_centre: { type: DataTypes.STRING(40) },
    billing_email: { type: DataTypes.STRING(254) },
    payments_customer_id: { type: DataTypes.STRING(64) },
    currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: "EUR" },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...timestamps,
  });

  await qi.createTable("users", {
    id,
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    client_id: fk("clients", { allowNull: true }),
    password_hash: { type: DataTypes.STRING(255) },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    last_sign_in_at: { type: DataTypes.DATE(3) },
    ...timestamps,
  });

  await qi.createTable("sessions", {
    id: { type: DataTypes.STRING(64), primaryKey: true },
    user_id: fk("users", { onDelete: "CASCADE" }),
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    ip: { type: DataTypes.STRING(45) },
    user_agent: { type: DataTypes.STRING(255) },
    created_at: timestamps.created_at,
  });
  await qi.addIndex("sessions", ["user_id"]);

  await qi.createTable("auth_tokens", {
    id,
    user_id: fk("users", { onDelete: "CASCADE" }),
    purpose: { type: DataTypes.ENUM("invitation", "reset"), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    used_at: { type: DataTypes.DATE(3) },
    created_by: fk("users", { allowNull: true }),
    created_at: timestamps.created_at,
  });

  await qi.createTable("sign_in_attempts", {
    id: bigId,
    email: { type: DataTypes.STRING(254), allowNull: false },
    ip: { type: DataTypes.STRING(45), allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    created_at: timestamps.created_at,
  });
  await qi.addIndex("sign_in_attempts", ["email", "created_at"]);
  await qi.addIndex("sign_in_attempts", ["ip", "created_at"]);

  await qi.createTable("projects", {
    id,
    code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(200), allowNull: false },
    client_id: fk("clients"),
    contact_name: { type: DataTypes.STRING(120) },
    contact_email: { type: DataTypes.STRING(254) },
    status: { type: DataTypes.ENUM("active", "paused", "closed"), allowNull: false, defaultValue: "active" },
    ...timestamps,
  });

  await qi.createTable("waste_streams", {
    id: { type: DataTypes.STRING(40), primaryKey: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    description: { type: DataTypes.TEXT },
    // Higher is more restrictive: a mix goes to the most restrictive stream of its components.
    restrictiveness: { type: DataTypes.INTEGER, allowNull: false },
    ...timestamps,
  });

  await qi.createTable("pickups", {
    id,
    reference: { type: DataTypes.STRING(64) },
    status: { type: DataTypes.ENUM("requested", "collected", "cancelled"), allowNull: false, defaultValue: "requested" },
    requested_at: { type: DataTypes.DATE(3), allowNull: false },
    requested_by: fk("users", { allowNull: true }),
    collected_at: { type: DataTypes.DATE(3) },
    manifest_ref: { type: DataTypes.STRING(64) },
    ...timestamps,
  });

  await qi.createTable("waste_containers", {
    id,
    code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    stream_id: { type: DataTypes.STRING(40), allowNull: false, references: { model: "waste_streams", key: "id" }, onUpdate: "CASCADE" },
    capacity_ml: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    estimated_volume_ml: volume(),
    room: { type: DataTypes.STRING(40), allowNull: false },
    location_kind: { type: DataTypes.ENUM("room", "satellite_area", "instrument"), allowNull: false, defaultValue: "instrument" },
    location_note: { type: DataTypes.STRING(120) },
    status: { type: DataTypes.ENUM("in_use", "full", "awaiting_pickup", "collected"), allowNull: false, defaultValue: "in_use" },
    accumulation_started_at: { type: DataTypes.DATE(3) },
    full_at: { type: DataTypes.DATE(3) },
    collected_at: { type: DataTypes.DATE(3) },
    pickup_id: fk("pickups", { allowNull: true }),
    ...timestamps,
  });

  await qi.createTable("waste_readings", {
    id,
    container_id: fk("waste_containers", { onDelete: "CASCADE" }),
    read_at: { type: DataTypes.DATE(3), allowNull: false },
    level_ml: volume(),
    estimated_before_ml: volume(),
    reader_id: fk("users", { allowNull: true }),
    note: { type: DataTypes.STRING(255) },
    created_at: timestamps.created_at,
  });

  await qi.createTable("instruments", {
    id,
    name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    kind: { type: DataTypes.STRING(80), allowNull: false },
    room: { type: DataTypes.STRING(40), allowNull: false },
    channels: { type: DataTypes.JSON, allowNull: false },
    waste_container_id: fk("waste_containers", { allowNull: true }),
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...timestamps,
  });

  await qi.createTable("methods", {
    id,
    name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    description: { type: DataTypes.TEXT },
    program: { type: DataTypes.JSON, allowNull: false },
    re_equilibration_min: { type: DataTypes.DECIMAL(8, 3), allowNull: false, defaultValue: 0 },
    run_time_min: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
    ...timestamps,
  });

  await qi.createTable("reagents", {
    id: { type: DataTypes.STRING(64), primaryKey: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    grades: { type: DataTypes.JSON, allowNull: false },
    unit: { type: DataTypes.ENUM("mL", "g"), allowNull: false },
    waste_stream_id: { type: DataTypes.STRING(40), references: { model: "waste_streams", key: "id" }, onUpdate: "CASCADE" },
    flammable: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    reorder_level: { type: DataTypes.DECIMAL(12, 3) },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...timestamps,
  });

  await qi.createTable("stock_lots", {
    id,
    reagent_id: { type: DataTypes.STRING(64), allowNull: false, references: { model: "reagents", key: "id" }, onUpdate: "CASCADE" },
    lot_number: { type: DataTypes.STRING(64), allowNull: false },
    supplier: { type: DataTypes.STRING(120), allowNull: false },
    grade: { type: DataTypes.STRING(40), allowNull: false },
    received_on: { type: DataTypes.DATEONLY, allowNull: false },
    opened_on: { type: DataTypes.DATEONLY },
    expires_on: { type: DataTypes.DATEONLY, allowNull: false },
    quantity: { type: DataTypes.DECIMAL(12, 3), allowNull: false },
    remaining: { type: DataTypes.DECIMAL(12, 3), allowNull: false },
    room: { type: DataTypes.STRING(40) },
    certificate_path: { type: DataTypes.STRING(255) },
    certificate_name: { type: DataTypes.STRING(255) },
    certificate_type: { type: DataTypes.STRING(64) },
    ...timestamps,
  });
  await qi.addIndex("stock_lots", ["reagent_id", "lot_number"], { unique: true });

  await qi.createTable("recipes", {
    id,
    code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    channel: { type: DataTypes.STRING(4) },
    status: { type: DataTypes.ENUM("draft", "approved", "retired"), allowNull: false, defaultValue: "draft" },
    created_by: fk("users", { allowNull: true }),
    ...timestamps,
  });

  await qi.createTable("recipe_versions", {
    id,
    recipe_id: fk("recipes", { onDelete: "CASCADE" }),
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    spec: { type: DataTypes.JSON, allowNull: false },
    detection_nm: { type: DataTypes.INTEGER.UNSIGNED },
    storage: { type: DataTypes.STRING(160) },
    notes: { type: DataTypes.TEXT },
    created_by: fk("users", { allowNull: true }),
    approved_by: fk("users", { allowNull: true }),
    approved_at: { type: DataTypes.DATE(3) },
    created_at: timestamps.created_at,
  });
  await qi.addIndex("recipe_versions", ["recipe_id", "version"], { unique: true });

  await qi.createTable("batches", {
    id,
    code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    recipe_version_id: fk("recipe_versions"),
    spec_snapshot: { type: DataTypes.JSON, allowNull: false },
    volume_ml: volume(),
    remaining_ml: volume(),
    bottles: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    bottle_size_ml: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    temperature_c: { type: DataTypes.DECIMAL(5, 2), allowNull: false, defaultValue: 25 },
    measured_ph: { type: DataTypes.DECIMAL(5, 3) },
    prepared_by: fk("users"),
    prepared_at: { type: DataTypes.DATE(3), allowNull: false },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    status: { type: DataTypes.ENUM("ready", "in_use", "empty", "discarded"), allowNull: false, defaultValue: "ready" },
    idempotency_key: { type: DataTypes.STRING(80), unique: true },
    ...timestamps,
  });

  await qi.createTable("batch_components", {
    id,
    batch_id: fk("batches", { onDelete: "CASCADE" }),
    reagent_id: { type: DataTypes.STRING(64), allowNull: false, references: { model: "reagents", key: "id" }, onUpdate: "CASCADE" },
    stock_lot_id: fk("stock_lots", { allowNull: true }),
    role: { type: DataTypes.ENUM("solvent", "buffer", "additive", "titrant"), allowNull: false },
    unit: { type: DataTypes.ENUM("mL", "g"), allowNull: false },
    target_amount: { type: DataTypes.DECIMAL(14, 5), allowNull: false },
    actual_amount: { type: DataTypes.DECIMAL(14, 5) },
  });

  await qi.createTable("imports", {
    id,
    kind: { type: DataTypes.STRING(40), allowNull: false },
    file_name: { type: DataTypes.STRING(255), allowNull: false },
    checksum: { type: DataTypes.CHAR(64), allowNull: false },
    row_count: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    errors: { type: DataTypes.JSON },
    status: { type: DataTypes.ENUM("validated", "committed", "failed"), allowNull: false },
    uploaded_by: fk("users", { allowNull: true }),
    ...timestamps,
  });

  await qi.createTable("runs", {
    id,
    instrument_id: fk("instruments"),
    method_id: fk("methods"),
    project_id: fk("projects"),
    operator_id: fk("users", { allowNull: true }),
    reference: { type: DataTypes.STRING(64) },
    started_at: { type: DataTypes.DATE(3), allowNull: false },
    injections: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    blanks: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    purge_ml: { type: DataTypes.DECIMAL(10, 3), allowNull: false, defaultValue: 0 },
    channel_batches: { type: DataTypes.JSON, allowNull: false },
    channel_volumes: { type: DataTypes.JSON, allowNull: false },
    import_id: fk("imports", { allowNull: true }),
    idempotency_key: { type: DataTypes.STRING(80), unique: true },
    ...timestamps,
  });
  await qi.addIndex("runs", ["instrument_id", "reference"], { unique: true });

  await qi.createTable("ledger_entries", {
    id: bigId,
    occurred_at: { type: DataTypes.DATE(3), allowNull: false },
    project_id: fk("projects", { allowNull: true }),
    kind: { type: DataTypes.ENUM("run", "draw", "preparation", "discard", "correction"), allowNull: false },
    batch_id: fk("batches", { allowNull: true }),
    reagent_id: { type: DataTypes.STRING(64), allowNull: false, references: { model: "reagents", key: "id" }, onUpdate: "CASCADE" },
    volume_ml: volume(),
    waste_stream_id: { type: DataTypes.STRING(40), references: { model: "waste_streams", key: "id" }, onUpdate: "CASCADE" },
    waste_container_id: fk("waste_containers", { allowNull: true }),
    source_kind: { type: DataTypes.ENUM("manual", "import", "run", "seed"), allowNull: false },
    source_id: { type: DataTypes.STRING(64) },
    author_id: fk("users", { allowNull: true }),
    reverses_id: { type: DataTypes.BIGINT.UNSIGNED, references: { model: "ledger_entries", key: "id" }, unique: true },
    reason: { type: DataTypes.STRING(255) },
    created_at: timestamps.created_at,
  });
  await qi.addIndex("ledger_entries", ["occurred_at", "project_id"]);
  await qi.addIndex("ledger_entries", ["project_id", "occurred_at"]);
  await qi.addIndex("ledger_entries", ["waste_container_id", "occurred_at"]);

  await qi.createTable("rates", {
    id,
    kind: { type: DataTypes.ENUM("reagent", "preparation_fee", "injection_fee"), allowNull: false },
    reagent_id: { type: DataTypes.STRING(64), references: { model: "reagents", key: "id" }, onUpdate: "CASCADE" },
    grade: { type: DataTypes.STRING(40) },
    price_list: { type: DataTypes.ENUM("internal", "external"), allowNull: false },
    unit: { type: DataTypes.ENUM("L", "g", "batch", "injection"), allowNull: false },
    amount_minor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    created_by: fk("users", { allowNull: true }),
    created_at: timestamps.created_at,
  });
  await qi.addIndex("rates", ["kind", "reagent_id", "price_list", "effective_from"]);

  await qi.createTable("statements", {
    id,
    client_id: fk("clients"),
    period_start: { type: DataTypes.DATEONLY, allowNull: false },
    period_end: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.ENUM("draft", "issued", "void"), allowNull: false, defaultValue: "draft" },
    lines: { type: DataTypes.JSON, allowNull: false },
    total_minor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    issued_at: { type: DataTypes.DATE(3) },
    created_by: fk("users", { allowNull: true }),
    ...timestamps,
  });
  await qi.addIndex("statements", ["client_id", "period_start", "period_end"], { unique: true });

  await qi.createTable("invoices", {
    id,
    statement_id: { ...fk("statements"), unique: true },
    client_id: fk("clients"),
    provider_invoice_id: { type: DataTypes.STRING(64), unique: true },
    provider_customer_id: { type: DataTypes.STRING(64) },
    hosted_url: { type: DataTypes.STRING(500) },
    status: { type: DataTypes.ENUM("draft", "open", "paid", "void", "uncollectible"), allowNull: false, defaultValue: "draft" },
    amount_minor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    due_on: { type: DataTypes.DATEONLY },
    sent_at: { type: DataTypes.DATE(3) },
    paid_at: { type: DataTypes.DATE(3) },
    ...timestamps,
  });

  await qi.createTable("period_locks", {
    id,
    client_id: fk("clients"),
    period_start: { type: DataTypes.DATEONLY, allowNull: false },
    period_end: { type: DataTypes.DATEONLY, allowNull: false },
    statement_id: fk("statements", { allowNull: true }),
    created_at: timestamps.created_at,
  });

  await qi.createTable("processed_events", {
    id: { type: DataTypes.STRING(80), primaryKey: true },
    type: { type: DataTypes.STRING(80), allowNull: false },
    created_at: timestamps.created_at,
  });

  await qi.createTable("idempotency_keys", {
    key: { type: DataTypes.STRING(120), primaryKey: true },
    scope: { type: DataTypes.STRING(60), allowNull: false },
    response: { type: DataTypes.JSON },
    created_at: timestamps.created_at,
  });

  await qi.createTable("job_locks", {
    name: { type: DataTypes.STRING(80), primaryKey: true },
    holder: { type: DataTypes.STRING(120), allowNull: false },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await qi.createTable("audit_log", {
    id: bigId,
    actor_id: fk("users", { allowNull: true }),
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(60), allowNull: false },
    entity_id: { type: DataTypes.STRING(64) },
    ip: { type: DataTypes.STRING(45) },
    before: { type: DataTypes.JSON },
    after: { type: DataTypes.JSON },
    created_at: timestamps.created_at,
  });
  await qi.addIndex("audit_log", ["entity", "entity_id"]);
  await qi.addIndex("audit_log", ["created_at"]);

  await qi.createTable("settings", {
    key: { type: DataTypes.STRING(80), primaryKey: true },
    value: { type: DataTypes.JSON, allowNull: false },
    updated_by: fk("users", { allowNull: true }),
    updated_at: timestamps.updated_at,
  });
}

/** In creation order, which `down` reverses. */
const TABLES_IN_CREATION_ORDER = `clients users sessions auth_tokens sign_in_attempts projects waste_streams pickups waste_containers
  waste_readings instruments methods reagents stock_lots recipes recipe_versions batches batch_components
  imports runs ledger_entries rates statements invoices period_locks processed_events idempotency_keys
  job_locks audit_log settings`.split(/\s+/);

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  for (const table of [...TABLES_IN_CREATION_ORDER].reverse()) await qi.dropTable(table);
}
