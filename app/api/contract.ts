/**
 * The API contract between Heatlag's user interface and its backend, defined once.
 *
 * Every method has a zod schema for its input and its output. The Electron main process (over IPC)
 * and the browser-mode server (over HTTP) validate every input against it before a handler runs; the
 * renderer's client validates every output. Units follow the project convention: °C, K for
 * differences, K/h for rates, hours for model time, epoch milliseconds (UTC) for timestamps.
 * Temperatures are converted to °F only where they are shown.
 *
 * This module imports only zod and core/mapping.ts (pure), so the preload, the renderer, the server and
 * main can all use it.
 */
import { z } from 'zod';
import { RUNTIME_BIN_HOURS } from '../../core/history.ts';
import { ColumnMappingSchema, DELIMITERS, RUNTIME_FORMATS } from '../../core/mapping.ts';
import { planMethods } from './plan.ts';
import { FallbackTimeZoneShape, TimeZoneName } from './time-zone.ts';
import { reportMethods } from './report.ts';

// ---------------------------------------------------------------------------------------------
// Building blocks

const Id = z.number().int().positive();
/** A person's name for a site, zone or mapping: trimmed, 1–120 characters, no control characters. */
const Name = z
  .string()
  .trim()
  .min(1, 'A name cannot be empty.')
  .max(120, 'A name can have at most 120 characters.')
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'A name cannot contain control characters.');
const Unit = z.enum(['C', 'F']);
/** A finite number, or null where the log had no value (JSON has no NaN). */
const Reading = z.number().nullable();
const Empty = z.object({}).strict();
const Interval = z.tuple([z.number(), z.number()]);
/** An interval whose bound may be unknown (null: the fit could not bound it). */
const LooseInterval = z.tuple([z.number().nullable(), z.number().nullable()]);
const MassNodeSchema = z.object({ airMassHours: z.number(), massOutdoorHours: z.number(), massShare: z.number() });

/** An uploaded file held by the backend until it is imported; the renderer never sees a path. */
export const FileRefSchema = z.object({
  fileId: z.string().regex(/^[A-Za-z0-9_-]{8,64}$/),
  name: z.string().max(260),
  size: z.number().int().nonnegative(),
});
export type FileRef = z.infer<typeof FileRefSchema>;

export const SettingsSchema = z.object({
  units: Unit,
});
export type Settings = z.infer<typeof SettingsSchema>;

export const AppInfoSchema = z.object({
  version: z.string(),
  /** 'desktop' inside Electron, 'browser' when served over HTTP. */
  mode: z.enum(['desktop', 'browser']),
  /** Where the database lives (shown in About, so a person can back it up). */
  databasePath: z.string(),
  /** The demo site made on first launch, null once deleted or when never made. */
  demoSiteId: Id.nullable(),
  /** Largest file the import accepts, bytes. */
  maxUploadBytes: z.number().int().positive(),
});
export type AppInfo = z.infer<typeof AppInfoSchema>;

export const ZoneInfoSchema = z.object({
  id: Id,
  siteId: Id,
  name: z.string(),
  samples: z.number().int().nonnegative(),
  firstTime: z.number().nullable(),
  lastTime: z.number().nullable(),
  /** The unit the zone's latest log was written in (°F logs are stored in °C); null before any import. */
  units: Unit.nullable(),
  /**
   * IANA time zone the zone's times are shown and planned in: the site's when set, else that of the
   * newest log that names one; null when neither (this computer's is used).
   */
  timezone: z.string().nullable(),
  logs: z.number().int().nonnegative(),
  hasResponse: z.boolean(),
  /** When the zone's newest log was imported (epoch ms); null before any import. A fit older than this is not current. */
  lastImportAt: z.number().nullable().optional(),
});
export type ZoneInfo = z.infer<typeof ZoneInfoSchema>;

export const SiteInfoSchema = z.object({
  id: Id,
  name: z.string(),
  isDemo: z.boolean(),
  /** The building's IANA time zone, set by the person; null when not set. */
  timezone: z.string().nullable(),
  /** The building's location (decimal degrees, north and east positive) for the solar term; null when not set. */
  location: z.object({ latDeg: z.number(), lonDeg: z.number() }).nullable().optional(),
  zones: z.array(ZoneInfoSchema),
});
export type SiteInfo = z.infer<typeof SiteInfoSchema>;

/** What a delete removes (or would remove), so the confirmation can say so. */
export const DeleteCountsSchema = z.object({
  zones: z.number().int().nonnegative(),
  logs: z.number().int().nonnegative(),
  samples: z.number().int().nonnegative(),
  rejectedRows: z.number().int().nonnegative(),
  responses: z.number().int().nonnegative(),
  schedules: z.number().int().nonnegative(),
});
export type DeleteCounts = z.infer<typeof DeleteCountsSchema>;

// ---------------------------------------------------------------------------------------------
// Import

/**
 * The column mapping of a log: the one schema of core/mapping.ts (pure, zod only), so that a mapping
 * saved from the import screen is the same JSON a person can write for the command line.
 */
export const MappingSchema = ColumnMappingSchema;
export type Mapping = z.infer<typeof MappingSchema>;

export const ReadOptionsSchema = z
  .object({
    delimiter: z.enum(DELIMITERS).optional(),
    decimal: z.enum(['.', ',']).optional(),
    units: Unit.optional(),
    timezone: ColumnMappingSchema.shape.timezone,
  })
  .strict();
export type ReadOptions = z.infer<typeof ReadOptionsSchema>;

export const ColumnRoleSchema = z.enum([
  'time', 'date', 'clock', 'indoor', 'outdoor', 'heatSetpoint', 'coolSetpoint', 'heating', 'cooling', 'heating+cooling',
]);
export type ColumnRole = z.infer<typeof ColumnRoleSchema>;

export const PreviewSchema = z.object({
  file: z.string(),
  encoding: z.string(),
  delimiter: z.enum(DELIMITERS),
  decimal: z.enum(['.', ',']),
  headerLine: z.number().int(),
  header: z.array(z.string()),
  /** The first data rows (up to 20) as text. */
  rows: z.array(z.array(z.string())),
  /** The detected (or given, completed) mapping; null when the time or indoor column was not found. */
  mapping: MappingSchema.nullable(),
  columns: z.array(
    z.object({
      index: z.number().int(),
      name: z.string(),
      role: ColumnRoleSchema.nullable(),
      unit: Unit.nullable(),
      runtimeAs: z.enum(RUNTIME_FORMATS).optional(),
    }),
  ),
  units: Unit.nullable(),
  timeFormat: z.string().nullable(),
  needsTimezone: z.boolean(),
  warnings: z.array(z.string()),
  /** What would stop an import as things stand; empty when it can run. */
  problems: z.array(z.string()),
});
export type Preview = z.infer<typeof PreviewSchema>;

export const RejectedRowSchema = z.object({
  /** 1-based line in the file. */
  line: z.number().int(),
  /** 1-based column, null when the row as a whole is at fault. */
  column: z.number().int().nullable(),
  columnName: z.string().nullable(),
  reason: z.string(),
  /** The row's text (stored rows only). */
  raw: z.string().optional(),
});
export type RejectedRow = z.infer<typeof RejectedRowSchema>;

export const ImportResultSchema = z.object({
  logId: Id,
  /**
   * False when the import added no reading: no log was kept, and logId is then the zone's log that holds
   * the readings already (the earlier import of the same file, else the newest log).
   */
  logAdded: z.boolean().optional(),
  file: z.string(),
  rowsAccepted: z.number().int().nonnegative(),
  rowsRejected: z.number().int().nonnegative(),
  duplicates: z.number().int().nonnegative(),
  /** The first rejected rows (all of them are available through rejectedRows). */
  rejected: z.array(RejectedRowSchema),
  firstTime: z.number().nullable(),
  lastTime: z.number().nullable(),
  intervalMinutes: z.number().nullable(),
  units: Unit,
  mapping: MappingSchema,
  encoding: z.string(),
  warnings: z.array(z.string()),
});
export type ImportResult = z.infer<typeof ImportResultSchema>;

export const ApiErrorSchema = z.object({
  /** Stable code: 'input', 'not-found', 'import', 'underdetermined', 'conflict', 'internal', … */
  code: z.string(),
  message: z.string(),
  file: z.string().optional(),
  line: z.number().int().optional(),
  column: z.string().optional(),
});
export type ApiErrorInfo = z.infer<typeof ApiErrorSchema>;

export const ImportStatusSchema = z.object({
  jobId: z.string(),
  /** 'cancelled': stopped by cancelImport before it committed; nothing was added. */
  state: z.enum(['running', 'done', 'failed', 'cancelled']),
  /** Rows (or bytes, whichever the importer reports) done and in total; total 0 while unknown. */
  done: z.number().nonnegative(),
  total: z.number().nonnegative(),
  result: ImportResultSchema.nullable(),
  error: ApiErrorSchema.nullable(),
});
export type ImportStatus = z.infer<typeof ImportStatusSchema>;

export const LogInfoSchema = z.object({
  id: Id,
  file: z.string(),
  importedAt: z.number(),
  units: Unit,
  rowsAccepted: z.number().int().nonnegative(),
  rowsRejected: z.number().int().nonnegative(),
  duplicates: z.number().int().nonnegative(),
  samples: z.number().int().nonnegative(),
  firstTime: z.number().nullable(),
  lastTime: z.number().nullable(),
  intervalMinutes: z.number().nullable(),
  timezone: z.string().nullable(),
  warnings: z.array(z.string()),
});
export type LogInfo = z.infer<typeof LogInfoSchema>;

export const SavedMappingSchema = z.object({ name: z.string(), mapping: MappingSchema });
export type SavedMapping = z.infer<typeof SavedMappingSchema>;

// ---------------------------------------------------------------------------------------------
// History and response

/** One chart line: times (epoch ms) and values (null at a gap in the log). */
const PointsSchema = z.object({ x: z.array(z.number()), y: z.array(Reading) });

/**
 * A zone's history for the chart (core/history.ts): the whole log's summary, and for the requested
 * window every series min–max decimated (°C; runtime as % of each bin of runtimeBinHours).
 */
export const HistorySchema = z.object({
  zoneId: Id,
  summary: z.object({
    readings: z.number().int().nonnegative(),
    firstTime: z.number().nullable(),
    lastTime: z.number().nullable(),
    stepMs: z.number().nullable(),
    indoor: z.object({ min: z.number(), max: z.number(), mean: z.number() }).nullable(),
    heatHours: z.number(),
    coolHours: z.number(),
    loggedHours: z.number(),
    has: z.object({ outdoor: z.boolean(), heatSetpoint: z.boolean(), coolSetpoint: z.boolean(), heat: z.boolean(), cool: z.boolean() }),
  }),
  window: z.object({
    fromMs: z.number(),
    toMs: z.number(),
    /** Readings in the window, and whether every one of them is sent (no decimation needed). */
    readings: z.number().int().nonnegative(),
    whole: z.boolean(),
  }),
  runtimeBinHours: z.number(),
  indoor: PointsSchema,
  outdoor: PointsSchema,
  heatSetpoint: PointsSchema,
  coolSetpoint: PointsSchema,
  heatRuntime: PointsSchema,
  coolRuntime: PointsSchema,
});
export type History = z.infer<typeof HistorySchema>;

export const ResponseSchema = z.object({
  tauHours: z.number(),
  heatRate: z.number(),
  coolRate: z.number(),
  gain: z.number(),
  tauCI: Interval,
  heatRateCI: Interval,
  coolRateCI: Interval.nullable(),
  hasHeating: z.boolean(),
  hasCooling: z.boolean(),
  /** Days (epoch ms ranges) held out of the fit and used only to check it. */
  heldOut: z.array(z.object({ from: z.number(), to: z.number() })),
  rmse: z.number(),
  heldOutRmse: z.number().nullable(),
  cvrmse: z.number(),
  nmbe: z.number(),
  samplesUsed: z.number().int(),
  daysUsed: z.number(),
  segments: z.number().int(),
  freeFloatHours: z.number(),
  firstTime: z.number(),
  lastTime: z.number(),
  warnings: z.array(z.string()),
  // What the screens and the report show beyond the one-node figures (core/types.ts ZoneResponse); optional so
  // a caller that sends only the figures above still passes.
  model: z.enum(['one-node', 'two-node']).optional(),
  mass: MassNodeSchema.nullable().optional(),
  solarGain: z.number().optional(),
  twoNode: z
    .object({ mass: MassNodeSchema, airMassHoursCI: LooseInterval, massOutdoorHoursCI: LooseInterval, massShareCI: LooseInterval, slowHours: z.number(), slowHoursCI: LooseInterval, fastHours: z.number() })
    .nullable()
    .optional(),
  solarGainCI: LooseInterval.nullable().optional(),
  gainCI: LooseInterval.optional(),
  selection: z
    .object({
      criterion: z.string(),
      candidates: z.array(z.object({ kind: z.enum(['one-node', 'two-node']), rss: z.number(), parameters: z.number(), score: z.number() })),
      effectiveReadings: z.number(),
      reason: z.string(),
    })
    .optional(),
  recoveryBacktest: z
    .object({
      cases: z.number().int().nonnegative(),
      medianErrorMinutes: z.number(),
      p90ErrorMinutes: z.number(),
      medianBiasMinutes: z.number(),
      mornings: z.array(
        z.object({ startMs: z.number(), fromC: z.number(), toC: z.number(), outdoorC: z.number(), actualMinutes: z.number(), predictedMinutes: z.number() }),
      ),
    })
    .nullable()
    .optional(),
  recoveryBacktestReason: z.string().nullable().optional(),
  timeZone: z.string().optional(),
});
export type ResponseInfo = z.infer<typeof ResponseSchema>;

/** Simulated against measured indoor temperature on days the fit did not see (°C). */
export const OverlaySchema = z.object({
  /** What the simulation is: 'held-out' days fitted without them, or 'fitted' days when too few. */
  kind: z.enum(['held-out', 'fitted']),
  time: z.array(z.number()),
  measured: z.array(Reading),
  simulated: z.array(Reading),
  outdoor: z.array(Reading),
  /** Start (epoch ms) of each simulated stretch, so the chart can mark where each day starts. */
  starts: z.array(z.number()),
  /** RMSE of this overlay, K. */
  rmse: z.number().nullable(),
});
export type Overlay = z.infer<typeof OverlaySchema>;

export const FitResultSchema = z.object({
  zoneId: Id,
  response: ResponseSchema,
  overlay: OverlaySchema.nullable(),
  /** When this response was fitted (epoch ms). */
  fittedAt: z.number().nullable(),
});
export type FitResult = z.infer<typeof FitResultSchema>;

// ---------------------------------------------------------------------------------------------
// The methods

const ZoneRef = z.object({ zoneId: Id }).strict();

function method<I extends z.ZodType, O extends z.ZodType>(input: I, output: O) {
  return { input, output };
}

/** Every backend method: its name, its input schema and its output schema. */
export const contract = {
  appInfo: method(Empty, AppInfoSchema),
  getSettings: method(Empty, SettingsSchema),
  setSettings: method(SettingsSchema.partial().strict(), SettingsSchema),

  listSites: method(Empty, z.array(SiteInfoSchema)),
  createSite: method(z.object({ name: Name }).strict(), SiteInfoSchema),
  renameSite: method(z.object({ siteId: Id, name: Name }).strict(), SiteInfoSchema),
  /** Sets (or with null clears) the site's time zone, which its zones' times and plans then use. */
  setSiteTimezone: method(z.object({ siteId: Id, timezone: TimeZoneName.nullable() }).strict(), SiteInfoSchema),
  /** Sets (or clears, with nulls) the site's latitude and longitude; out-of-range values are refused. */
  setSiteLocation: method(
    z.object({ siteId: Id, latDeg: z.number().finite().min(-90, 'The latitude must be from -90 to 90 degrees.').max(90, 'The latitude must be from -90 to 90 degrees.').nullable(), lonDeg: z.number().finite().min(-180, 'The longitude must be from -180 to 180 degrees.').max(180, 'The longitude must be from -180 to 180 degrees.').nullable() }).strict(),
    SiteInfoSchema,
  ),
  /** What deleting the site would remove, for the confirmation. */
  siteDeletePreview: method(z.object({ siteId: Id }).strict(), DeleteCountsSchema),
  deleteSite: method(z.object({ siteId: Id }).strict(), DeleteCountsSchema),

  createZone: method(z.object({ siteId: Id, name: Name }).strict(), ZoneInfoSchema),
  renameZone: method(z.object({ zoneId: Id, name: Name }).strict(), ZoneInfoSchema),
  zoneDeletePreview: method(ZoneRef, DeleteCountsSchema),
  deleteZone: method(ZoneRef, DeleteCountsSchema),

  /** Desktop only: the open-file dialog; null when the person cancels. */
  chooseLogFile: method(Empty, FileRefSchema.nullable()),
  /** Desktop only: a save dialog for a text file (CSV of rejected rows); false when cancelled. */
  saveTextFile: method(
    z.object({ suggestedName: z.string().min(1).max(200), content: z.string().max(50_000_000) }).strict(),
    z.boolean(),
  ),
  /** Forgets an uploaded file that will not be imported. */
  discardFile: method(z.object({ fileId: FileRefSchema.shape.fileId }).strict(), z.boolean()),

  /**
   * What an import would read. `mapping` (the one being edited) is kept when the delimiter or decimal
   * mark is changed, so the person's column roles survive a re-read.
   */
  previewLog: method(
    z.object({ fileId: FileRefSchema.shape.fileId, options: ReadOptionsSchema.optional(), mapping: MappingSchema.optional() }).strict(),
    PreviewSchema,
  ),
  startImport: method(
    z
      .object({
        fileId: FileRefSchema.shape.fileId,
        zoneId: Id,
        mapping: MappingSchema,
      })
      .strict(),
    z.object({ jobId: z.string() }),
  ),
  importStatus: method(z.object({ jobId: z.string().max(64) }).strict(), ImportStatusSchema),
  /** Stops a running import before it commits (nothing is added); the job's status says 'cancelled'. */
  cancelImport: method(z.object({ jobId: z.string().max(64) }).strict(), ImportStatusSchema),
  rejectedRows: method(
    z
      .object({
        logId: Id,
        limit: z.number().int().min(1).max(100_000).optional(),
        offset: z.number().int().min(0).optional(),
      })
      .strict(),
    z.object({ total: z.number().int().nonnegative(), rows: z.array(RejectedRowSchema) }),
  ),
  listLogs: method(ZoneRef, z.array(LogInfoSchema)),
  listMappings: method(Empty, z.array(SavedMappingSchema)),
  saveMapping: method(z.object({ name: Name, mapping: MappingSchema }).strict(), z.array(SavedMappingSchema)),

  /**
   * The zone's history for a chart window (the whole log when fromMs/toMs are left out), decimated to
   * `buckets` equal-time buckets; runtime averaged over bins of `runtimeBinHours`.
   */
  zoneHistory: method(
    z
      .object({
        zoneId: Id,
        fromMs: z.number().optional(),
        toMs: z.number().optional(),
        buckets: z.number().int().min(10).max(10_000),
        runtimeBinHours: z.number().refine((h) => (RUNTIME_BIN_HOURS as readonly number[]).includes(h), {
          message: `must be one of ${RUNTIME_BIN_HOURS.join(', ')} hours`,
        }),
      })
      .strict(),
    HistorySchema,
  ),
  /** Fits the zone's response from all its logs (local days of the zone's time zone) and stores it. */
  fitZone: method(z.object({ zoneId: Id, ...FallbackTimeZoneShape }).strict(), FitResultSchema),
  /** The latest stored response, or null when the zone has not been fitted. */
  latestResponse: method(ZoneRef, FitResultSchema.nullable()),

  /** Setback planning: saved schedules, outdoor weeks, the plan of a zone and of a site (app/api/plan.ts). */
  ...planMethods,

  /** The zone report: the log's quality, and the desktop's export and PDF dialogs (app/api/report.ts). */
  ...reportMethods,
} as const;

export type Contract = typeof contract;
export type Method = keyof Contract;
export type MethodInput<M extends Method> = z.input<Contract[M]['input']>;
export type MethodOutput<M extends Method> = z.output<Contract[M]['output']>;

/** The typed API: one async function per method. */
export type HeatlagApi = { [M in Method]: (input: MethodInput<M>) => Promise<MethodOutput<M>> };

export const methodNames = Object.freeze(Object.keys(contract) as Method[]);

export function isMethod(name: string): name is Method {
  return Object.prototype.hasOwnProperty.call(contract, name);
}

/** The envelope every call returns over IPC and HTTP: errors travel as data, never as thrown objects. */
export type Envelope<T> = { ok: true; value: T } | { ok: false; error: ApiErrorInfo };

/** IPC channel names: one per method, prefixed so nothing else can be invoked. */
export const IPC_PREFIX = 'heatlag:';
export const IPC_UPLOAD = 'heatlag:upload';

/** HTTP: the header that carries the per-launch token. */
export const TOKEN_HEADER = 'x-heatlag-token';

/** Uploaded logs larger than this are refused (bytes). */
export const MAX_UPLOAD_BYTES = 256 * 1024 * 1024;
/** JSON request bodies over HTTP larger than this are refused (bytes). */
export const MAX_JSON_BYTES = 1024 * 1024;

/** An error returned by the backend, rethrown on the calling side with its fields. */
export class ApiError extends Error {
  readonly code: string;
  readonly file?: string;
  readonly line?: number;
  readonly column?: string;
  constructor(info: ApiErrorInfo) {
    super(info.message);
    this.name = 'ApiError';
    this.code = info.code;
    if (info.file !== undefined) this.file = info.file;
    if (info.line !== undefined) this.line = info.line;
    if (info.column !== undefined) this.column = info.column;
  }
}

/** A plain sentence for a failed input validation: the first issue, naming the field. */
export function describeZodError(method: string, error: z.ZodError): string {
  const issue = error.issues[0];
  if (!issue) return `The request to ${method} was not valid.`;
  const where = issue.path.length ? ` (${issue.path.join('.')})` : '';
  return `The request to ${method} was not valid${where}: ${issue.message}`;
}
