import { z } from "zod";
import { sql } from "drizzle-orm";
import type { Db, DbOrTx } from "../../db/client";
import { inList } from "../../db/values";
import { timeOrderedId } from "../../db/ids";
import type { Clock } from "../../platform/clock";
import type { SessionUser } from "../../http/route";
import { AppError, Errors, notFound, refused } from "../../http/errors";
import { statusContext, statusContextOf, toolsByTagsSelect, toolsWithStatusByTags, toolsWithStatusFromRows, type ToolStatusView } from "../tools/tool-status.service";
import { jobsRepository, type JobForReading } from "../jobs/jobs.repository";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { itemViewsOf } from "../limit-tables/limit-tables.service";
import { readingsRepository, type ReadingInsert } from "./readings.repository";
import { studyFlagCondition } from "../studies/studies.service";
import { STUDY_READING_FLAG } from "../../../shared/studies/studies.schemas";
import { readOnlySettings } from "../settings/settings.service";
import type { Settings } from "../../../shared/settings/settings.schemas";
import { can } from "../../../shared/auth/roles";
import { num } from "../../../shared/common/decimal";
import { convertLength, type LengthUnit } from "../../../shared/common/units";
import { chooseFeelerLeaves, stackAsLeaf, stackFrom, usableLeaves, type FeelerChoice, type FeelerEvidence, type FeelerLeaf, type LeafStack } from "../../../shared/inspection/feeler";
import { resolutionFlag, toTableUnit, withinToolRange } from "../../../shared/inspection/check-sheet";
import { dependentItems, judgeReading, judgeRow, JUDGING_RULES_VERSION, lengthText, type JudgingContext, type ReadingEvidence } from "../../../shared/inspection/judging";
import type { CreateReading, LeafView, ReadingFlag, ReadingResult } from "../../../shared/readings/readings.schemas";
import type { LimitItemView } from "../../../shared/limit-tables/limit-tables.schemas";
import { evidenceOfRow } from "./reading-evidence";

type ToolHit = Awaited<ReturnType<typeof toolsWithStatusByTags>>[number];

// Transfer gauges carry a size to a micrometer; the values are read on the micrometer.
const TRANSFER_KINDS = new Set(["telescoping_gauge", "small_hole_gauge"]);
const READ_KINDS = new Set(["outside_micrometer", "inside_micrometer", "dial_indicator", "caliper", "other"]);

const STATUS_FLAGS: Partial<Record<string, ReadingFlag>> = {
  overdue: "tool_overdue",
  out_of_tolerance: "tool_out_of_tolerance",
  quarantined: "tool_quarantined",
  never_calibrated: "tool_never_calibrated",
};

/** The tools a reading names, as their tags are matched (a tag typed in lower case is the same tool). */
const tagsOf = (input: Pick<CreateReading, "toolAssetTags">) => [...new Set(input.toolAssetTags.map((t) => t.toUpperCase()))];

/** A 400 shaped like the zod issues every other bad input gets. */
function badInput(path: (string | number)[], message: string): never {
  throw new z.ZodError([{ code: "custom", path, message, input: undefined }]);
}

interface Place {
  jobId: string;
  itemKey: string;
  index: number;
}

export function readingsService(deps: { db: Db; clock: Clock; config: { SHOP_TIME_ZONE: string } }) {
  const { db, clock } = deps;

  /** The leaves of a set for a feeler item, in the table's unit, and the go and no-go chosen inside the limits. */
  async function feelerLeaves(tx: DbOrTx, item: LimitItemView, tableUnit: LengthUnit, set: ToolHit, status: ToolStatusView | undefined, at: Date) {
    const raw = await readingsRepository.leavesOf(tx, set.tool.id, status?.lastCalibration?.id ?? null, at);
    const leaves: FeelerLeaf[] = raw.map((l) => ({
      id: l.id,
      label: l.label,
      nominal: num(convertLength(l.nominal, set.tool.unit, tableUnit)),
      calibratedThickness: l.calibrated == null ? null : num(convertLength(l.calibrated, set.tool.unit, tableUnit)),
      rejected: l.rejected,
    }));
    const choice = chooseFeelerLeaves({ leaves, min: item.min!, max: item.max!, fmt: (v) => lengthText(v, tableUnit) });
    return { choice, usable: usableLeaves(leaves) };
  }

  /** The item at a place and every item of its table (kept per process: a saved table never changes). */
  async function loadItem(tx: DbOrTx, limitTableId: string, itemKey: string) {
    const items = await itemViewsOf(tx, limitTableId);
    return { item: items.find((i) => i.key === itemKey), items };
  }

  /**
   * Records one reading at `place`, after every rule of the trade: the job is not signed, the item and index exist,
   * enough values, tools exist, are usable at this instant (or quality overrides with a reason), suit the item.
   * Flags what is allowed but worth a second look. Each read is a statement of its own and nothing is locked until the
   * write, which is one statement that takes the sheet's and the place's locks and looks at the place again
   * (readingsRepository.insertRecorded): a reading that lost a race for its place is refused as if it had come second.
   */
  async function record(
    job: JobForReading,
    place: Place,
    input: CreateReading,
    user: SessionUser,
    settings: Readonly<Settings>,
    extra: { supersedesId?: string; supersedeReason?: string } = {},
  ): Promise<ReadingResult> {
    const at = clock.now();
    const tableUnit = job.tableUnit;
    const { item: found, items } = await loadItem(db, job.job.limitTableId, place.itemKey);
    if (!found) badInput(["itemKey"], `This sheet has no item "${place.itemKey}".`);
    const item = found as LimitItemView;
    if (place.index > item.repeat) badInput(["index"], `${item.label} has ${item.repeat} place${item.repeat === 1 ? "" : "s"}; there is no number ${place.index}.`);
    if (item.kind === "clearance") badInput(["itemKey"], "A clearance is worked out from its bore and journal readings; record those instead.");
    if (item.kind === "taper") badInput(["itemKey"], "A taper is worked out from the readings at its two stations; record those instead.");

    // What each kind of item needs (beyond the shared schema, which cannot know the item).
    if (item.kind === "journal" || item.kind === "bore") {
      const values = input.values ?? [];
      if (values.length < item.directions) badInput(["values"], `${item.label} needs a value in each of ${item.directions} directions; ${values.length} given.`);
      if (input.toolAssetTags.length === 0) badInput(["toolAssetTags"], "Name the tool (or tools) the values were read with.");
    } else if (item.kind === "feeler") {
      if (input.toolAssetTags.length === 0) badInput(["toolAssetTags"], "Name the feeler set used.");
    } else if (item.kind === "visual") {
      if (!input.visualResult) badInput(["visualResult"], "Say whether the part is serviceable or rejected.");
      if (input.visualResult === "reject" && !input.finding) badInput(["finding"], "Describe what was found.");
    }
    const tags = tagsOf(input);
    if (tags.length !== input.toolAssetTags.length) badInput(["toolAssetTags"], "A tool is named twice.");
    // Each tool with its status at this instant (the one status derivation decides): read in the statement that read
    // the sheet when the caller asked it there, else in one statement now.
    const named = job.alsoRead ? await toolsWithStatusFromRows(db, job.alsoRead, at, statusContextOf(settings)) : await toolsWithStatusByTags(db, tags, at, statusContextOf(settings));
    const hits = tags.map((tag) => {
      const hit = named.find((f) => f.tool.assetTag.toUpperCase() === tag);
      if (!hit) throw notFound("tool", tag);
      return hit;
    });

    // Which tool the values are read on, and which set gives the leaves.
    let readTool: ToolHit | undefined;
    let feelerSet: ToolHit | undefined;
    if (item.kind === "journal" || item.kind === "bore") {
      readTool = hits.find((h) => READ_KINDS.has(h.kind));
      if (!readTool) {
        throw refused(
          hits.some((h) => TRANSFER_KINDS.has(h.kind)) ? "micrometer_not_named" : "tool_kind_unsuitable",
          hits.some((h) => TRANSFER_KINDS.has(h.kind))
            ? "A bore read through a telescoping or small-hole gauge names the micrometer that read the gauge too."
            : "None of these tools reads a size; name the micrometer used.",
        );
      }
      if (item.toolKinds?.length && !hits.some((h) => item.toolKinds!.includes(h.kind))) {
        throw refused("tool_kind_unsuitable", `${item.label} is measured with: ${item.toolKinds.join(", ").replace(/_/g, " ")}.`);
      }
    } else if (item.kind === "feeler") {
      feelerSet = hits.find((h) => h.kind === "feeler_set");
      if (!feelerSet) throw refused("tool_kind_unsuitable", "A feeler gap is checked with a feeler set; name the set.");
    }

    // Usable at this instant?
    const statuses = new Map(hits.map((h) => [h.tool.id, h.status]));
    const flags = new Set<ReadingFlag>();
    const unusable: { assetTag: string; status: string; reasons: string[] }[] = [];
    for (const h of hits) {
      const s = statuses.get(h.tool.id)!;
      let usable = s.usableForAcceptance;
      const reasons = [...s.reasons];
      // A limited tool may read only inside the part of its range it was calibrated for.
      const lim = s.lastCalibration?.limitedRange;
      if (usable && s.status === "limited" && lim && h === readTool) {
        if (!withinToolRange(input.values ?? [], convertLength(lim.min, lim.unit, h.tool.unit), convertLength(lim.max, lim.unit, h.tool.unit))) {
          usable = false;
          reasons.unshift(`Values outside the calibrated part of the range (${lim.min}–${lim.max} ${lim.unit}).`);
        }
      }
      if (!h.tool.acceptanceUse && usable) {
        usable = false;
        reasons.push("This tool is not for acceptance readings.");
      }
      if (!usable) {
        unusable.push({ assetTag: h.tool.assetTag, status: s.status, reasons });
        const f = STATUS_FLAGS[s.status];
        if (f) flags.add(f);
      }
      const mine = s.custodian?.userId === user.id || h.tool.ownerUserId === user.id;
      if (!mine) flags.add("not_in_custody");
    }
    let override: { reason: string; by: string } | null = null;
    if (unusable.length) {
      if (!input.override) {
        const first = unusable[0];
        throw refused("tool_not_usable", `${first.assetTag} may not be used now: ${first.reasons[0] ?? first.status}`, { tools: unusable });
      }
      if (!can(user.role, "readings.override")) throw Errors.forbidden("Only quality may accept a reading taken with an unusable tool.");
      override = { reason: input.override.reason, by: user.id };
      flags.add("override");
    } else {
      for (const f of ["tool_overdue", "tool_out_of_tolerance", "tool_quarantined", "tool_never_calibrated"] as const) flags.delete(f);
    }

    // The gauge-study flag of a measured size (is the characteristic's latest study with these tools' families not
    // acceptable?) came with the sheet. One reading per place (a second one is a correction with a reason) is the
    // write's own check, under the place's lock.
    const measured = item.kind === "journal" || item.kind === "bore";
    // The places this reading completes (clearances, tapers) at its index, and the other places each is judged from.
    const views = items as LimitItemView[];
    const dependents = dependentItems(views, item.key).filter((d) => place.index <= d.repeat);
    const partnerKeysOf = (d: (typeof dependents)[number]) => [d.boreKey, d.journalKey, ...(d.stationKeys ?? [])].filter((k): k is string => !!k && k !== item.key);
    const partnerKeys = [...new Set(dependents.flatMap(partnerKeysOf))];

    const base = {
      jobId: place.jobId,
      itemKey: item.key,
      index: place.index,
      takenBy: user.id,
      takenAt: at,
      temperatureC: input.temperatureC == null ? null : String(input.temperatureC),
      toolTemperatureC: input.toolTemperatureC == null ? null : String(input.toolTemperatureC),
      partMaterial: input.partMaterial ?? null,
      supersedesId: extra.supersedesId ?? null,
      supersedeReason: extra.supersedeReason ?? null,
      overrideReason: override?.reason ?? null,
      overrideBy: override?.by ?? null,
      finding: input.finding ?? null,
    };
    const jctx: JudgingContext = { tableUnit, tableExpansionPerK: job.tableExpansionPerK == null ? null : Number(job.tableExpansionPerK) };
    let values: Omit<ReadingInsert, "flags" | "verdict">;
    let evidence: ReadingEvidence;
    const result: Partial<ReadingResult> = {};

    if (item.kind === "journal" || item.kind === "bore") {
      const rt = readTool!;
      const typed = input.values!;
      const inTable = toTableUnit(typed, rt.tool.unit, tableUnit);
      const lo = inTable.reduce((a, b) => (b.lt(a) ? b : a));
      const hi = inTable.reduce((a, b) => (b.gt(a) ? b : a));
      const rawSize = item.kind === "journal" ? lo : hi;
      if (!withinToolRange(typed, rt.tool.rangeMin, rt.tool.rangeMax)) flags.add("outside_tool_range");
      for (const h of hits.filter((x) => TRANSFER_KINDS.has(x.kind))) {
        if (!withinToolRange([convertLength(rawSize, tableUnit, h.tool.unit)], h.tool.rangeMin, h.tool.rangeMax)) flags.add("outside_tool_range");
      }
      if (resolutionFlag(item, rt.tool.resolution, rt.tool.unit, tableUnit, settings.resolutionRatio)) flags.add("resolution_too_coarse");
      // Stored exactly: the values as typed (in the read tool's unit), the size and out-of-round as read in the table's unit.
      values = { ...base, values: typed.map(String), unit: rt.tool.unit, size: rawSize.toString(), outOfRound: hi.minus(lo).toString() };
      evidence = { itemKey: item.key, index: place.index, unit: rt.tool.unit, values: typed, temperatureC: input.temperatureC, toolTemperatureC: input.toolTemperatureC, partMaterial: input.partMaterial };
      result.size = num(rawSize);
      result.outOfRound = num(hi.minus(lo));
    } else if (item.kind === "feeler") {
      const { choice, usable } = await feelerLeaves(db, item, tableUnit, feelerSet!, statuses.get(feelerSet!.tool.id), at);
      const check = feelerCheckFrom(item, feelerSet!.tool.assetTag, choice, usable, input);
      const first = (s: LeafStack | null) => s?.leaves[0]?.id ?? null;
      values = {
        ...base,
        values: [],
        unit: tableUnit,
        goEntered: check.goEntered,
        noGoEntered: check.noGoEntered,
        goLeafId: first(check.go),
        noGoLeafId: first(check.noGo),
        feelerCheck: { mode: check.mode, go: check.go, noGo: check.noGo, gap: check.gap, why: check.why },
      };
      evidence = { itemKey: item.key, index: place.index, unit: tableUnit, values: [], feeler: check };
      if (check.mode === "go_no_go") {
        result.goLeaf = leafView(check.go!);
        result.noGoLeaf = leafView(check.noGo!);
      } else result.measuredGap = leafView(check.gap!);
    } else {
      values = { ...base, values: [], unit: tableUnit, visualResult: input.visualResult! };
      evidence = { itemKey: item.key, index: place.index, unit: tableUnit, values: [], visualResult: input.visualResult, finding: input.finding };
    }

    if (measured && job.flagged) flags.add(STUDY_READING_FLAG);
    const judged = judgeReading(item, evidence, jctx);
    const verdict = judged.view.verdict;
    const flagList = [...flags];
    const readingId = timeOrderedId();
    const stored = { ...values, id: readingId, verdict, flags: flagList };
    const audit = {
      actorId: user.id,
      action: extra.supersedesId ? "reading.supersede" : "reading.create",
      entityType: "reading",
      entityId: readingId,
      after: { jobId: place.jobId, itemKey: item.key, index: place.index, values: stored.values, tools: tags, flags: flagList, supersedesId: extra.supersedesId, reason: extra.supersedeReason, override: override?.reason },
      at,
    };
    let partnerRows: Awaited<ReturnType<typeof readingsRepository.insertRecorded>>;
    try {
      partnerRows = await readingsRepository.insertRecorded(
        db,
        stored,
        hits.map((h, i) => {
          const s = statuses.get(h.tool.id)!;
          return { toolId: h.tool.id, position: i + 1, statusAtReading: s.status, dueAtReading: s.dueAt, takenAt: at };
        }),
        { rulesVersion: JUDGING_RULES_VERSION, verdict, band: judged.view.band, text: judged.view.text, detail: judged.view, judgedAt: at },
        audit,
        { onSigned: !!extra.supersedesId, partnerKeys },
      );
    } catch (e) {
      // Another write reached the sheet or the place first (between this write's reads and its write).
      const lost = readingsRepository.placeRefusal(e);
      if (lost?.code === "sheet_signed") throw signedRefusal();
      if (lost?.code === "reading_exists") throw placeTaken(item.label, place.index, lost.holderId);
      if (lost?.code === "reading_superseded") throw alreadyCorrected(lost.holderId);
      throw e;
    }

    // The places this reading completes (clearances, tapers), with the partner readings on the sheet (read by the write).
    const completes: ReadingResult["completes"] = [];
    for (const d of dependents) {
      const partners = new Map<string, ReadingEvidence>();
      for (const k of partnerKeysOf(d)) {
        const pr = partnerRows.get(k);
        if (pr) partners.set(k, evidenceOfRow(pr));
      }
      const j = judgeRow(views, d, place.index, (k, i) => (i !== place.index ? undefined : k === item.key ? evidence : partners.get(k)), jctx);
      if (j.view.kind === "pending") continue;
      completes.push({ label: `${d.label}${d.repeat > 1 ? ` no. ${place.index}` : ""}`, place: j.view });
      if (j.view.kind === "fit" && result.clearance === undefined) {
        result.clearance = j.view.loosest.value;
        result.tightestClearance = j.view.tightest.value;
        result.clearanceBasis = j.view.basis;
        result.loosestVerdict = j.view.loosest.verdict;
        result.tightestVerdict = j.view.tightest.verdict;
      }
    }
    return { id: readingId, ...result, verdict, verdictText: judged.view.text, flags: flagList, place: judged.view, completes, rulesVersion: JUDGING_RULES_VERSION };
  }

  /**
   * What the write needs of the sheet, with the tools named and their status and the gauge-study flag of the item with
   * these tools' families, in one statement; refused when signed unless `allowSigned`.
   */
  async function openJob(jobId: string, allowSigned: boolean, itemKey: string, tags: string[]) {
    // One placeholder per tag (inList): the statement's shape is the number of tools named.
    const tagSlots = tags.map((_, i) => sql.placeholder(`tag${i}`));
    const also = tags.length
      ? {
          shape: `tools-and-study-flag|${tags.length}`,
          alsoRead: () => toolsByTagsSelect(tagSlots),
          flag: () =>
            studyFlagCondition({
              limitTableId: sql`jobs.limit_table_id`,
              itemKey: sql.placeholder("itemKey"),
              toolFamilyIds: sql`select t.family_id from tools t where ${inList(sql`t.asset_tag`, tagSlots, "text")}`,
            }),
          values: { ...Object.fromEntries(tags.map((tag, i) => [`tag${i}`, tag])), itemKey },
        }
      : undefined;
    const job = await jobsRepository.forReading(db, jobId, also);
    if (!job) throw notFound("job", jobId);
    if (job.signed && !allowSigned) throw signedRefusal();
    return job;
  }

  return {
    /** POST /api/jobs/:id/readings */
    async create(jobId: string, input: CreateReading, user: SessionUser) {
      // The shop's settings as this instance holds them (read again every few seconds).
      const settings = await readOnlySettings(db, deps.config.SHOP_TIME_ZONE);
      const index = input.index ?? 1;
      // The sheet and the tools named with their status in one statement: the write looks at the sheet and the place
      // again under their locks; the tools are not what the locks guard (a tool's status may change while a reading
      // waits either way).
      const job = await openJob(jobId, false, input.itemKey, tagsOf(input));
      return record(job, { jobId, itemKey: input.itemKey, index }, input, user, settings);
    },

    /** POST /api/readings/:id/supersede — append-only correction; the old reading stays, marked superseded. */
    async supersede(readingId: string, input: Omit<CreateReading, "itemKey" | "index"> & { reason: string }, user: SessionUser) {
      const settings = await readOnlySettings(db, deps.config.SHOP_TIME_ZONE);
      const old = await readingsRepository.findById(db, readingId);
      if (!old) throw notFound("reading", readingId);
      // A correction is allowed on a signed sheet: it reopens the sheet for signing again.
      const job = await openJob(old.jobId, true, old.itemKey, tagsOf(input));
      const newer = await readingsRepository.successorOf(db, readingId);
      if (newer) throw alreadyCorrected(newer.id);
      const { reason, ...rest } = input;
      return record(job, { jobId: old.jobId, itemKey: old.itemKey, index: old.index }, { ...rest, itemKey: old.itemKey, index: old.index }, user, settings, { supersedesId: old.id, supersedeReason: reason });
    },

    /** The leaves a mechanic should pick for a feeler item from a set, as the server would. */
    async leavesFor(jobId: string, itemKey: string, setTag: string) {
      const summary = await jobsRepository.summary(db, jobId);
      if (!summary) throw notFound("job", jobId);
      const tableUnit = (await limitTablesRepository.summary(db, summary.job.limitTableId))!.table.unit;
      const { item } = await loadItem(db, summary.job.limitTableId, itemKey);
      if (!item || item.kind !== "feeler") throw new AppError("item_not_found", 404, `This sheet has no feeler item "${itemKey}".`);
      const at = clock.now();
      const [hit] = await toolsWithStatusByTags(db, [setTag.toUpperCase()], at, await statusContext(db, deps.config.SHOP_TIME_ZONE));
      if (!hit) throw notFound("tool", setTag);
      if (hit.kind !== "feeler_set") throw refused("tool_kind_unsuitable", `${hit.tool.assetTag} is not a feeler set.`);
      const { choice, usable } = await feelerLeaves(db, item, tableUnit, hit, hit.status, at);
      return {
        mode: choice.mode,
        goLeaf: choice.mode === "go_no_go" ? leafView(choice.go) : null,
        noGoLeaf: choice.mode === "go_no_go" ? leafView(choice.noGo) : null,
        why: choice.why,
        leaves: usable,
        unit: tableUnit,
        min: item.min!,
        max: item.max!,
      };
    },
  };
}

/** A go, no-go or measured gap as the API shows it: one leaf, or a stack with its total thickness. */
const leafView = (s: LeafStack): LeafView => stackAsLeaf(s);

/**
 * The feeler check a reading records, after the rules of the trade: with leaves inside the limits, the go and no-go
 * results; when the set cannot make both inside the limits, the thickest leaf or stack that entered (a measured gap).
 */
function feelerCheckFrom(item: LimitItemView, setTag: string, choice: FeelerChoice, usable: ReturnType<typeof usableLeaves>, input: CreateReading): FeelerEvidence {
  if (choice.mode === "go_no_go") {
    if (input.gapLeafIds?.length) badInput(["gapLeafIds"], `${setTag} makes a go and a no-go inside the limits of ${item.label}; say whether each entered instead.`);
    if (input.goEntered == null) badInput(["goEntered"], "Say whether the go leaf entered.");
    if (input.noGoEntered == null) badInput(["noGoEntered"], "Say whether the no-go leaf entered.");
    return { mode: "go_no_go", go: choice.go, noGo: choice.noGo, goEntered: input.goEntered!, noGoEntered: input.noGoEntered!, gap: null, why: choice.why };
  }
  if (usable.length === 0) throw refused("feeler_leaf_missing", `${setTag} has no calibrated, serviceable leaf; use another set.`);
  if (!input.gapLeafIds?.length) throw refused("feeler_measured_gap_needed", `${setTag} cannot check ${item.label} go/no-go inside its limits. ${choice.why}`, { why: choice.why });
  if (new Set(input.gapLeafIds).size !== input.gapLeafIds.length) badInput(["gapLeafIds"], "A leaf is named twice in the stack.");
  const gap = stackFrom(usable, input.gapLeafIds);
  if (!gap) badInput(["gapLeafIds"], `Use leaves of ${setTag} that are calibrated and not rejected.`);
  return { mode: "measured_gap", go: null, noGo: null, goEntered: null, noGoEntered: null, gap, why: choice.why };
}

const signedRefusal = () => refused("sheet_signed", "This check sheet is signed and locked; correct a reading with a reason instead.");
const placeTaken = (label: string, index: number, readingId: string | null) =>
  refused("reading_exists", `${label} no. ${index} already has a reading; correct it with a reason instead.`, { readingId });
const alreadyCorrected = (currentId: string | null) => refused("reading_superseded", "This reading has already been corrected; correct the current one.", { currentId });
