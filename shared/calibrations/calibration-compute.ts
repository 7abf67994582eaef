// One calibration worked out from what was entered: used live by the calibration form and, identically, by the server before it signs.
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { convertLength, formatLength, type LengthUnit } from "../common/units";
import { calibrationResult, DecisionRuleError, judgePoint, type AsFoundStatement, type CalibrationResult, type DecisionRule, type JudgedPoint } from "./decision-rules";
import { meanOf, pointBudget, roundUncertainty, type StandardContribution, type UncertaintyBudget } from "./uncertainty";
import { gaugeBlockGrade, gaugeBlockTolerance } from "./gauge-block-grades";

export { roundUncertainty };

export interface ComputePointInput {
  nominal: number;
  reference?: number | null;
  asFound: number;
  asLeft?: number | null;
  mpe?: number | null;
  uncertainty?: number | null;
  elementId?: string | null;
  /** Repeated as-found readings at the point; as-found is their mean. */
  repeatReadings?: number[] | null;
}

/** A reference standard as the computation takes it: its certificate's U, k and ν, and the certified values it gives. */
export interface ComputeStandard {
  assetTag: string;
  kind: string;
  unit: LengthUnit;
  /** ISO 3650 grade of a gauge block set ("0", "1"…), used for blocks the certificate gives no value for. */
  grade: string | null;
  certificateNumber: string | null;
  expandedUncertainty: number;
  coverageFactor: number;
  /** Degrees of freedom of the certificate's U; null = infinite (a certificate stating k = 2 for about 95 %). */
  degreesOfFreedom: number | null;
  /** A single standard's nominal length and certified value. */
  nominal: DecimalLike | null;
  certifiedValue: DecimalLike | null;
  /** A set's elements (gauge blocks): nominal and certified deviation, the deviation null when not certified. */
  elements: { label: string; nominal: DecimalLike; deviation: DecimalLike | null }[];
}

/** A reference standard and the certificate covering the day, as the server's rows (decimal strings) or the API (numbers) give them. */
export interface StandardWithCertificate {
  standard: { assetTag: string; kind: string; unit: LengthUnit; nominal: DecimalLike | null; grade?: string | null };
  certificate: {
    number: string;
    expandedUncertainty: DecimalLike;
    coverageFactor: DecimalLike;
    degreesOfFreedom?: DecimalLike | null;
    certifiedValue?: DecimalLike | null;
    elementValues?: { label: string; nominal: DecimalLike; deviation?: DecimalLike | null }[] | null;
  };
}

/** The one mapping from a standard's certificate to what the computation takes. Used by the server before it signs and by the form while the person types. */
export function standardForCompute({ standard, certificate: c }: StandardWithCertificate): ComputeStandard {
  return {
    assetTag: standard.assetTag,
    kind: standard.kind,
    unit: standard.unit,
    grade: standard.grade ?? null,
    certificateNumber: c.number,
    expandedUncertainty: num(dec(c.expandedUncertainty)),
    coverageFactor: num(dec(c.coverageFactor)),
    degreesOfFreedom: c.degreesOfFreedom == null ? null : num(dec(c.degreesOfFreedom)),
    nominal: standard.nominal,
    certifiedValue: c.certifiedValue ?? null,
    elements: (c.elementValues ?? []).map((e) => ({ label: e.label, nominal: e.nominal, deviation: e.deviation ?? null })),
  };
}

export interface ComputeCalibrationInput {
  rule: DecisionRule;
  /** r of the rule guarded_scaled (w = r·U); the shop's setting. */
  guardBandMultiplier?: DecimalLike;
  /** The record says the tool was adjusted; undefined = not stated (refused when an as-left reading differs from the as-found). */
  adjusted?: boolean | null;
  /** Unit and resolution of the tool under test. */
  unit: LengthUnit;
  resolution: number;
  temperatureC?: number | null;
  /** ± variation of temperature between tool and standard during the calibration, °C. */
  temperatureVariationC?: number | null;
  /** Further contributions to every point's budget (standard uncertainty in the tool's unit). */
  otherUncertainties?: { source: string; standardUncertainty: number; degreesOfFreedom?: number | null }[];
  /** Family's ± MPE, the default for every point. */
  familyMpe?: DecimalLike | null;
  /** Family's check plan, for per-point MPEs. */
  checkPlan?: { nominal: DecimalLike; mpe?: DecimalLike | null }[];
  /** Standards used. */
  standards?: ComputeStandard[];
  limitedRange?: { min: number; max: number } | null;
  points: ComputePointInput[];
}

/** One piece of a reference: a single standard, or one block of a stack. */
export interface ReferencePart {
  standard: string;
  /** The block's label, or null for a single standard. */
  element: string | null;
  /** Nominal and the value used, in the tool's unit. */
  nominal: number;
  value: number;
  certified: boolean;
}

export interface ComputedPoint extends JudgedPoint {
  seq: number;
  elementId: string | null;
  asFound: number;
  asLeft: number | null;
  repeatReadings: number[] | null;
  uncertainty: number | null;
  /** Where U came from: entered, or the budget. */
  uncertaintySource: "given" | "budget" | "none";
  referenceSource: "given" | "certified" | "partly_certified" | "nominal";
  referenceParts: ReferencePart[];
  mpeSource: "given" | "check_plan" | "family";
  /** The budget U was computed from; null when U was entered or no budget could be made. */
  budget: UncertaintyBudget | null;
}

export interface ComputedCalibration {
  points: ComputedPoint[];
  result: CalibrationResult;
  adjusted: boolean;
  asFoundInTolerance: boolean;
  asFoundStatement: AsFoundStatement;
  /** Some point's TUR is under 4:1 (ANSI/NCSL Z540.3). */
  turWarning: boolean;
}

interface Piece {
  part: ReferencePart;
  nominal: Decimal;
  value: Decimal;
  contribution: StandardContribution;
}

const GAUGE_BLOCK_KINDS = new Set(["gauge_block_set", "check_block"]);

/** Every single standard and every block of every set, in the tool's unit, with what it adds to a budget. */
function piecesOf(standards: ComputeStandard[], unit: LengthUnit): Piece[] {
  const out: Piece[] = [];
  for (const s of standards) {
    const U = convertLength(s.expandedUncertainty, s.unit, unit).toNumber();
    const cert = (label: string): StandardContribution => ({
      kind: "certificate",
      source: `${label}: certificate ${s.certificateNumber ?? "—"} (U = ${sig(U)} ${unit}, k = ${s.coverageFactor})`,
      expandedUncertainty: U,
      coverageFactor: s.coverageFactor,
      dof: s.degreesOfFreedom,
    });
    const grade = GAUGE_BLOCK_KINDS.has(s.kind) ? gaugeBlockGrade(s.grade) : null;
    // A block the certificate gives no value for is used at its nominal; its deviation is then only known to lie within the grade's ± te (ISO 3650), a rectangular distribution.
    const uncertified = (label: string, nominal: Decimal): StandardContribution => {
      const te = grade ? gaugeBlockTolerance(convertLength(nominal, unit, s.unit), s.unit, grade) : null;
      if (te != null) {
        const teHere = convertLength(te, s.unit, unit).toNumber();
        return { kind: "grade", source: `${label}: no certified value, nominal used within grade ${grade} (ISO 3650 ± ${sig(teHere)} ${unit})`, halfWidth: teHere };
      }
      const c = cert(label) as Extract<StandardContribution, { kind: "certificate" }>;
      return { ...c, source: `${c.source}; no certified value, nominal used` };
    };
    if (s.elements.length > 0) {
      for (const e of s.elements) {
        const nominal = convertLength(e.nominal, s.unit, unit);
        const certified = e.deviation != null;
        const value = certified ? convertLength(dec(e.nominal).plus(dec(e.deviation!)), s.unit, unit) : nominal;
        const label = `${s.assetTag} block ${e.label}`;
        out.push({ part: { standard: s.assetTag, element: e.label, nominal: num(nominal), value: num(value), certified }, nominal, value, contribution: certified ? cert(label) : uncertified(label, nominal) });
      }
    } else if (s.nominal != null) {
      const nominal = convertLength(s.nominal, s.unit, unit);
      const certified = s.certifiedValue != null;
      const value = certified ? convertLength(s.certifiedValue!, s.unit, unit) : nominal;
      out.push({ part: { standard: s.assetTag, element: null, nominal: num(nominal), value: num(value), certified }, nominal, value, contribution: certified ? cert(s.assetTag) : uncertified(s.assetTag, nominal) });
    }
  }
  return out;
}

/**
 * The fewest pieces (up to four) whose nominals add up exactly to the size, preferring certified pieces: a 7.7 mm point
 * from a 5 mm and a 2.7 mm block, each with its own certified value (common practice of building a size from a set).
 */
function findStack(pieces: Piece[], size: Decimal, pairs: () => Map<string, [number, number][]>): Piece[] | null {
  const byNominal = new Map<string, number[]>();
  pieces.forEach((p, i) => byNominal.set(p.nominal.toString(), [...(byNominal.get(p.nominal.toString()) ?? []), i]));
  const best = (combos: number[][]) => {
    if (combos.length === 0) return null;
    const score = (c: number[]) => c.filter((i) => pieces[i].part.certified).length;
    combos.sort((a, b) => score(b) - score(a) || a.join(",").localeCompare(b.join(",")));
    return combos[0].map((i) => pieces[i]);
  };
  const key = (d: Decimal) => d.toString();
  const one = (byNominal.get(key(size)) ?? []).map((i) => [i]);
  if (one.length) return best(one);
  const two: number[][] = [];
  pieces.forEach((p, i) => {
    for (const j of byNominal.get(key(size.minus(p.nominal))) ?? []) if (j > i) two.push([i, j]);
  });
  if (two.length) return best(two);
  const three: number[][] = [];
  for (let i = 0; i < pieces.length; i++) {
    for (let j = i + 1; j < pieces.length; j++) {
      for (const k of byNominal.get(key(size.minus(pieces[i].nominal).minus(pieces[j].nominal))) ?? []) if (k > j) three.push([i, j, k]);
    }
  }
  if (three.length) return best(three);
  const four: number[][] = [];
  const pairMap = pairs();
  for (const [sum, list] of pairMap) {
    const rest = pairMap.get(key(size.minus(dec(sum)))) ?? [];
    for (const [a, b] of list) for (const [c, d] of rest) if (b < c) four.push([a, b, c, d]);
  }
  return best(four);
}

function pairSums(pieces: Piece[]): Map<string, [number, number][]> {
  const m = new Map<string, [number, number][]>();
  for (let i = 0; i < pieces.length; i++) {
    for (let j = i + 1; j < pieces.length; j++) {
      const k = pieces[i].nominal.plus(pieces[j].nominal).toString();
      m.set(k, [...(m.get(k) ?? []), [i, j]]);
    }
  }
  return m;
}

/** Three significant digits, for the words of a budget row. */
const sig = (x: number) => Number(x.toPrecision(3));

function sameLength(a: DecimalLike, b: DecimalLike) {
  return dec(a).equals(dec(b));
}

/**
 * Works out every point (reference, MPE and U defaults, the budget, errors, as-found statement, release verdict, TUR)
 * and the overall result. Throws DecisionRuleError, naming the point, when a point cannot be judged.
 */
export function computeCalibration(input: ComputeCalibrationInput): ComputedCalibration {
  if (input.points.length === 0) throw new DecisionRuleError("no_points", "A calibration needs at least one check point");
  const unit = input.unit;
  const pieces = piecesOf(input.standards ?? [], unit);
  let pairCache: Map<string, [number, number][]> | null = null;
  const pairs = () => (pairCache ??= pairSums(pieces));
  const labelOf = (i: number, p: ComputePointInput) => `Point ${i + 1} (${p.nominal} ${unit})`;

  let adjusted = input.adjusted ?? null;
  if (adjusted == null) {
    // An as-left reading that differs, with no word on an adjustment, may be a repeat reading: the record must say which.
    const i = input.points.findIndex((p) => p.asLeft != null && !sameLength(p.asLeft, p.asFound));
    if (i >= 0) {
      throw new DecisionRuleError(
        "adjustment_unstated",
        `${labelOf(i, input.points[i])}: the as-left reading differs from the as-found; say whether the tool was adjusted (adjusted: true), or record repeat readings instead`,
      );
    }
    adjusted = false;
  }

  const points = input.points.map((p, i): ComputedPoint => {
    const label = labelOf(i, p);
    const planMpe = input.checkPlan?.find((c) => c.mpe != null && sameLength(c.nominal, p.nominal))?.mpe;
    const mpe = p.mpe ?? planMpe ?? input.familyMpe ?? null;
    if (mpe == null) throw new DecisionRuleError("invalid_mpe", `${label} has no permissible error (MPE), and the family sets none; give one for the point`);

    const readings = p.repeatReadings && p.repeatReadings.length > 0 ? p.repeatReadings : null;
    if (readings) {
      if (readings.length < 2) throw new DecisionRuleError("readings_mismatch", `${label}: repeat readings need at least two readings`);
      const mean = meanOf(readings);
      // As-found is the reported indication: the mean of the repeated readings, rounded no coarser than the resolution.
      if (dec(p.asFound).minus(mean).abs().gt(dec(input.resolution).div(2))) {
        throw new DecisionRuleError(
          "readings_mismatch",
          `${label}: the as-found reading should be the mean of the repeated readings (${formatLength(mean, unit, Math.max(6, (String(input.resolution).split(".")[1]?.length ?? 0) + 1))} ${unit})`,
        );
      }
    }

    const stack = findStack(pieces, dec(p.nominal), pairs);
    const reference: Decimal = p.reference != null ? dec(p.reference) : stack ? stack.reduce((sum, s) => sum.plus(s.value), new Decimal(0)) : dec(p.nominal);
    const referenceSource: ComputedPoint["referenceSource"] =
      p.reference != null ? "given" : !stack || stack.every((s) => !s.part.certified) ? "nominal" : stack.every((s) => s.part.certified) ? "certified" : "partly_certified";

    let uncertainty: number | null = p.uncertainty ?? null;
    let uncertaintySource: ComputedPoint["uncertaintySource"] = uncertainty == null ? "none" : "given";
    let budget: UncertaintyBudget | null = null;
    if (uncertainty == null && (input.standards?.length ?? 0) > 0) {
      // Every standard the reference was built from; when none matches the size, every standard named on the record (the safe side).
      const contributions = stack
        ? stack.map((s) => s.contribution)
        : wholeStandards(input.standards!, unit).map((c) => ({ ...c, source: `${c.source} (not matched to this size)` }));
      budget = pointBudget({
        unit,
        standards: contributions,
        resolution: input.resolution,
        repeatReadings: readings,
        lengthMm: convertLength(p.nominal, unit, "mm").toNumber(),
        temperatureC: input.temperatureC ?? null,
        temperatureVariationC: input.temperatureVariationC ?? null,
        others: (input.otherUncertainties ?? []).map((o) => ({ source: o.source, u: o.standardUncertainty, dof: o.degreesOfFreedom ?? null })),
      });
      uncertainty = roundUncertainty(budget.expanded);
      uncertaintySource = "budget";
    }

    const judged = judgePoint({
      nominal: p.nominal,
      reference,
      asFound: p.asFound,
      asLeft: p.asLeft ?? null,
      adjusted: adjusted!,
      mpe,
      uncertainty,
      rule: input.rule,
      guardBandMultiplier: input.guardBandMultiplier,
      label,
    });
    return {
      ...judged,
      seq: i + 1,
      elementId: p.elementId ?? null,
      asFound: p.asFound,
      asLeft: p.asLeft ?? null,
      repeatReadings: readings,
      uncertainty,
      uncertaintySource,
      referenceSource,
      referenceParts: stack ? stack.map((s) => s.part) : [],
      mpeSource: p.mpe != null ? "given" : planMpe != null ? "check_plan" : "family",
      budget,
    };
  });

  const outcome = calibrationResult(points, { limitedRange: input.limitedRange ?? null, adjusted: adjusted! });
  return { points, ...outcome, adjusted: adjusted!, turWarning: points.some((p) => p.turAdequate === false) };
}

/** Each standard once, by its certificate's U/k, for a point no standard was matched to. */
function wholeStandards(standards: ComputeStandard[], unit: LengthUnit): StandardContribution[] {
  return standards.map((s) => {
    const U = convertLength(s.expandedUncertainty, s.unit, unit).toNumber();
    return { kind: "certificate", source: `${s.assetTag}: certificate ${s.certificateNumber ?? "—"} (U = ${sig(U)} ${unit}, k = ${s.coverageFactor})`, expandedUncertainty: U, coverageFactor: s.coverageFactor, dof: s.degreesOfFreedom };
  });
}
