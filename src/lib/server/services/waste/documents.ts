// What the waste documents print: the period report (/api/waste/report) and the container label
// (/api/waste/containers/{id}/label.pdf). The renderers are pure (lib/waste/report, container-label).
import { getReagent } from "../../../chem";
import type { ContainerLabelContent } from "../../../waste/container-label";
import { containerHazards } from "../../../waste/hazards";
import type { Period } from "../../../waste/period";
import type { ReportData } from "../../../waste/report";
import { Setting } from "../../models/audit";
import { getContainer, listContainers } from "./containers";
import { flammablesByRoom } from "./flammables";
import { containerHistory } from "./readings";
import { wasteReport } from "./totals";
import { isoWithOffset } from "../../../format";
import { getFacilitySettings } from "../facility-settings";

async function facilityName(): Promise<string> {
  const row = await Setting.findByPk("facility.name");
  return typeof row?.value === "string" ? row.value : "Decant facility";
}

/** Everything the CSV and PDF report of a period show. */
export async function wasteReportData(period: Period, now = new Date()): Promise<ReportData> {
  const [report, containers, flammables, facility, { timeZone }] = await Promise.all([
    wasteReport(period),
    listContainers({ now }),
    flammablesByRoom(now),
    facilityName(),
    getFacilitySettings(),
  ]);
  return {
    facility,
    generatedAt: isoWithOffset(now, timeZone),
    timeZone,
    period,
    total_mL: report.total_mL,
    streams: report.streams,
    byRoom: report.byRoom,
    byProject: report.byProject,
    byMonth: report.byMonth,
    containers: containers.map((c) => ({
      code: c.code,
      stream: c.stream,
      room: c.room,
      status: c.status,
      estimated_mL: c.estimated_mL,
      capacity_mL: c.capacity_mL,
      fill_percent: c.fill.percent,
      since: c.accumulationStartedAt?.slice(0, 10) ?? null,
    })),
    flammables: flammables.map((f) => ({ room: f.room, onHand_L: f.onHand_L, limit_L: f.limit_L, state: f.state })),
  };
}

/** What the container label prints. */
export async function containerLabelContent(id: number): Promise<ContainerLabelContent> {
  const [container, history, facility] = await Promise.all([getContainer(id), containerHistory(id), facilityName()]);
  const hazards = containerHazards(container.streamId, history.contents);
  return {
    code: container.code,
    streamName: container.stream,
    capacity_mL: container.capacity_mL,
    room: container.room,
    where: container.locationNote,
    accumulationStartedOn: container.accumulationStartedAt?.slice(0, 10) ?? null,
    pictograms: hazards.pictograms,
    signalWord: hazards.signalWord,
    contents: history.contents.slice(0, 5).map((c) => getReagent(c.reagentId)?.name ?? c.reagentId),
    facility,
  };
}
