import { z } from "zod";
import { CalendarDateSchema, LengthSchema, PageQuerySchema, UnitSchema, optionalText } from "../common/lists.schemas";
import { TOOL_KINDS } from "../families/families.schemas";

/** Kinds of reference standard: the tool kinds of api.md plus the check block used for intermediate checks. */
export const STANDARD_KINDS = [...TOOL_KINDS, "check_block"] as const;
export const StandardKindSchema = z.enum(STANDARD_KINDS);

/** One element of a set standard (e.g. a gauge block): nominal and its certified deviation, null when the certificate gives none (the block is then used at its nominal, within its grade). */
export const ElementValueSchema = z.object({
  label: z.string().trim().min(1).max(40),
  nominal: LengthSchema,
  deviation: LengthSchema.nullish(),
});

/** A calibration certificate of a reference standard (api.md: number, lab, issuedAt, dueAt, expandedUncertainty, coverageFactor). */
export const CertificateInputSchema = z
  .object({
    number: z.string().trim().min(1, "Give the certificate number.").max(80),
    /** Name of the issuing lab as printed on the certificate. */
    lab: z.string().trim().min(1, "Name the issuing lab.").max(120),
    /** The lab in Tenthwise's list of outside labs, when it is one. */
    labId: z.string().uuid().nullish(),
    issuedAt: CalendarDateSchema,
    dueAt: CalendarDateSchema,
    /** Expanded uncertainty U in the standard's unit. */
    expandedUncertainty: LengthSchema.nonnegative(),
    // k is about 2 for 95 % (JCGM 100:2008, 6.3.3); anything past 10 is a slip.
    coverageFactor: z.number().positive().max(10).default(2),
    /** Degrees of freedom of U where the certificate states them; absent = infinite (k = 2 for about 95 %). */
    degreesOfFreedom: z.number().min(1).nullish(),
    accreditationBody: optionalText(120),
    scope: optionalText(500),
    /** The national measurement institute the certificate traces to. */
    nationalInstitute: optionalText(200),
    /** Certified value of a single standard (e.g. a setting standard's length). */
    certifiedValue: LengthSchema.nullish(),
    elementValues: z.array(ElementValueSchema).max(200).optional(),
  })
  .refine((c) => c.dueAt >= c.issuedAt, { message: "The due date is before the issue date.", path: ["dueAt"] });
export type CertificateInput = z.input<typeof CertificateInputSchema>;

/** POST /api/standards/:id/certificates: a new certificate after recalibration. */
export const AddCertificateSchema = CertificateInputSchema;
export type AddCertificate = z.infer<typeof AddCertificateSchema>;

/** POST /api/standards (api.md): assetTag, name, kind, unit, certificate. */
export const CreateStandardSchema = z.object({
  assetTag: z
    .string()
    .trim()
    .min(1, "Give the asset tag.")
    .max(40)
    .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, "Use letters, digits, dots, dashes and underscores only."),
  name: z.string().trim().min(1, "Name the standard.").max(120),
  kind: StandardKindSchema,
  unit: UnitSchema,
  /** Nominal length of a single standard (setting standard, check block). */
  nominal: LengthSchema.positive().nullish(),
  grade: optionalText(20),
  location: optionalText(80),
  certificate: CertificateInputSchema,
});
export type CreateStandardInput = z.input<typeof CreateStandardSchema>;
export type CreateStandard = z.infer<typeof CreateStandardSchema>;

export const CertificateSchema = z.object({
  id: z.string(),
  number: z.string(),
  labId: z.string().nullable(),
  labName: z.string(),
  accreditationBody: z.string().nullable(),
  scope: z.string().nullable(),
  nationalInstitute: z.string().nullable(),
  issuedAt: CalendarDateSchema,
  dueAt: CalendarDateSchema,
  expandedUncertainty: z.number(),
  coverageFactor: z.number(),
  degreesOfFreedom: z.number().nullable(),
  certifiedValue: z.number().nullable(),
  elementValues: z.array(z.object({ label: z.string(), nominal: z.number(), deviation: z.number().nullable() })).nullable(),
  hasFile: z.boolean(),
  /** GET this path for the certificate file (PDF or image) when hasFile. */
  fileUrl: z.string().nullable(),
  createdAt: z.string(),
});
export type Certificate = z.infer<typeof CertificateSchema>;

export const StandardSchema = z.object({
  id: z.string(),
  assetTag: z.string(),
  name: z.string(),
  kind: StandardKindSchema,
  unit: UnitSchema,
  nominal: z.number().nullable(),
  grade: z.string().nullable(),
  location: z.string().nullable(),
  /** A certificate covers today's date (shop zone): issuedAt through dueAt. */
  inCalibration: z.boolean(),
  /** Due date of the certificate in force (or the latest one). */
  dueAt: CalendarDateSchema.nullable(),
  /** The certificate in force today, else the latest. */
  certificate: CertificateSchema.nullable(),
  createdAt: z.string(),
});
export type Standard = z.infer<typeof StandardSchema>;

/** GET /api/standards/:id: the standard with every certificate, newest first. */
export const StandardDetailSchema = StandardSchema.extend({ certificates: z.array(CertificateSchema) });
export type StandardDetail = z.infer<typeof StandardDetailSchema>;

export const StandardListQuerySchema = PageQuerySchema.extend({
  q: optionalText(100),
  kind: StandardKindSchema.optional(),
  unit: UnitSchema.optional(),
  inCalibration: z.enum(["true", "false"]).transform((v) => v === "true").optional(),
});
export type StandardListQuery = z.infer<typeof StandardListQuerySchema>;
