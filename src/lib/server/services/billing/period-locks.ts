/**
 * Period locks: once a client's statement is issued, its period is closed for that client. The
 * ledger asks here where a late entry belongs, so an issued statement never changes.
 */
import { Op, type Transaction } from "sequelize";
import { nextDay } from "../../../billing/statement";
import { localDay, startOfLocalDay } from "../../../format";
import { PeriodLock } from "../../models/billing";
import { Project } from "../../models/organisation";
import { getFacilitySettings } from "../facility-settings";

/** A day as given, an instant as its local day in the facility's zone (periods are local days). */
const dayOf = (date: Date | string, timeZone: string) => (typeof date === "string" ? date.slice(0, 10) : localDay(date, timeZone));

/** The client's lock covering that day, the one that ends last when several do. */
const lockCovering = (clientId: number, day: string, transaction?: Transaction) =>
  PeriodLock.findOne({
    where: { clientId, periodStart: { [Op.lte]: day }, periodEnd: { [Op.gte]: day } },
    order: [["periodEnd", "DESC"]],
    transaction,
  });

/** True when the client's statement covering that day has been issued (or invoiced). */
export async function isPeriodLocked(clientId: number, date: Date | string, transaction?: Transaction): Promise<boolean> {
  const { timeZone } = await getFacilitySettings(transaction);
  return (await lockCovering(clientId, dayOf(date, timeZone), transaction)) !== null;
}

/**
 * Where an entry dated `date` for the client belongs: `date` itself while its period is open,
 * otherwise the first instant after the locked periods that cover it (the next open period).
 * The ledger service dates late corrections with this, so an issued statement never changes.
 */
export async function openDateFor(clientId: number, date: Date, transaction?: Transaction): Promise<Date> {
  let at = date;
  const { timeZone } = await getFacilitySettings(transaction);
  for (let guard = 0; guard < 1000; guard++) {
    const lock = await lockCovering(clientId, dayOf(at, timeZone), transaction);
    if (!lock) return at;
    at = startOfLocalDay(nextDay(String(lock.periodEnd)), timeZone);
  }
  throw new Error("openDateFor: period locks form a loop");
}

/** The same for a project's entry (the ledger knows projects, not clients); null project → unchanged. */
export async function openDateForProject(projectId: number | null, date: Date, transaction?: Transaction): Promise<Date> {
  if (projectId === null) return date;
  const project = await Project.findByPk(projectId, { transaction });
  return project ? openDateFor(project.clientId, date, transaction) : date;
}
