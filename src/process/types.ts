/**
 * The contract of a melting process (a plug-in): its inputs, result fields, statuses, model
 * options and compute function, declared as data. Everything generic (sweep validator, planner,
 * worker, Arrow schema, CSV sidecar, README tables, `column`, inspect, report, sensitivity) reads
 * a process through these types; nothing generic names an input or a result.
 */
import type { FieldInfo } from '../physics/fields.js';
import type { ColumnStatus } from '../physics/types.js';
import type { ProfileSamples } from './chunk-result.js';
import type { ProblemList } from '../spec/problems.js';
import type { ModelSpec } from '../spec/types.js';
import type { FigureLayout } from '../report/figure.js';

/**
 * One scenario input of a process: a float64 column of the results table. Also an allowed range
 * (`min`/`max` in `unit`), checked the same way by the sweep validator and the CLI.
 */
export interface InputDef extends FieldInfo {
  readonly kind: 'float64';
  /** the `column` / `plot column` option without dashes, e.g. 'tp' for --tp */
  readonly cliFlag: string;
  /** smallest allowed value (inclusive unless minExclusive) */
  readonly min: number;
  /** largest allowed value (inclusive) */
  readonly max: number;
  /** true when min itself is not allowed */
  readonly minExclusive: boolean;
  /**
   * value when neither swept nor fixed: a number; null = must be swept or fixed; NaN = "not given"
   * (only where the process allows it: the rows carry NaN and the field is nullable)
   */
  readonly default: number | null;
}

/** A numeric result column of a process (float64; NaN in the typed arrays = null). */
export interface ResultDef extends FieldInfo {
  readonly kind: 'float64';
}

/** What compute returns for one scenario. */
export interface ProcessResult {
  readonly status: ColumnStatus;
  /** why the scenario failed or fell outside the range; null for ok and no_melt rows */
  readonly reason: string | null;
  /** every result field of the process by name (null where it does not apply) */
  readonly values: Readonly<Record<string, number | null>>;
  /** arrays along the column (only when the model asked for them), keyed by profile field name */
  readonly profile?: Readonly<Record<string, Float64Array>>;
}

/** The `model` section of a sweep file, as far as a process is concerned. */
export interface ProcessModelOptions {
  /** model keys this process accepts, besides `process` (e.g. thermal, water, params, step_gpa) */
  readonly keys: readonly string[];
  /** the value of each optional key when the file leaves it out */
  readonly defaults: Readonly<Record<string, unknown>>;
  /**
   * Validate the section (every problem recorded with its path, e.g. `model.thermal`) and
   * return its normalized, JSON-plain form (key order fixed; `process` omitted for the default
   * process so stored specs and hashes of older files do not change), or undefined on a problem.
   * Wrap it with `describeModelValidator` (src/spec/json-schema.ts) to state each key's JSON Schema
   * for `meltsweep schema`; without it the sweep-file schema checks the keys by name only.
   */
  validate(raw: Readonly<Record<string, unknown>>, problems: ProblemList, context?: ModelContext): ModelSpec | undefined;
  /**
   * the canonical form of an already valid section (used by normalizeSweep); `given` names the
   * sweep's swept and fixed inputs, for defaults that depend on them
   */
  normalize(model: ModelSpec, given?: ReadonlySet<string>): ModelSpec;
  /**
   * Checks that need the model and the inputs a sweep gives (swept or fixed), e.g. "conductive
   * needs an upwelling rate". Optional.
   */
  checkInputs?(model: ModelSpec, given: ReadonlySet<string>, problems: ProblemList): void;
  /** the options in words for `plan` (e.g. "thermal auto, water batch, step 0.05 GPa"); absent: "key value" pairs */
  summary?(model: ModelSpec): string;
  /**
   * Optional: options of `meltsweep column` that set model keys of this process (e.g. --heat sets
   * `heat`). The value is handed to `validate` as text (or as { file } for `file` flags, a path
   * relative to the working folder). Decompression's --mode, --thermal and --step are built in.
   */
  readonly cliFlags?: readonly ModelFlag[];
  /**
   * Optional: words added to "X is not an input of process P; its inputs: ..." when the model
   * options removed inputs (e.g. "the geotherm table sets the temperatures"); null for none.
   */
  inputsNote?(model: ModelSpec): string | null;
  /**
   * Optional, for the sweep file's JSON Schema: model options that change which inputs the process
   * takes. Each case: `when`, a JSON Schema of the model section that selects it (e.g. geotherm is a
   * mapping), and `model`, a sample section for which inputsFor gives the case's inputs. Absent: the
   * inputs of the default options hold for every section.
   */
  readonly inputCases?: readonly { readonly when: { readonly [keyword: string]: unknown }; readonly model: ModelSpec }[];
}

/** Where a model section comes from, for options that name files. */
export interface ModelContext {
  /** folder that relative file names in the section start from (the sweep file's folder); default: the working folder */
  readonly baseDir?: string;
}

/** A `meltsweep column` option that sets one model key of a process. */
export interface ModelFlag {
  /** the option without dashes, e.g. 'heat' */
  readonly flag: string;
  /** the model key it sets */
  readonly key: string;
  /** the value placeholder in the help text, e.g. 'mode' or 'file.csv' */
  readonly placeholder: string;
  readonly description: string;
  /** 'text': the value as given; 'file': the value becomes { file: VALUE } */
  readonly kind: 'text' | 'file';
}

/** How a run asks for a process's runtime model. */
export interface ResolveOptions {
  /** the columns keep their profile arrays */
  readonly withProfile: boolean;
}

/**
 * A melting process. `M` is its runtime model (parameters resolved, options read), built once
 * per thread by `resolveModel` and handed to every `compute` call.
 */
export interface ProcessDefinition<M = unknown> {
  /** registry key, written as `model.process` and in the schema metadata `meltsweep.process` */
  readonly name: string;
  /** one-line title, e.g. "decompression melting of an upwelling column" */
  readonly title: string;
  readonly description: string;
  /** its inputs in table order; a function of the model section (options may remove inputs) */
  inputsFor(model: ModelSpec): readonly InputDef[];
  /** its numeric result fields in table order (status and reason are common to all processes) */
  readonly results: readonly ResultDef[];
  /**
   * Optional: result fields that model options add after `results` (e.g. the capped-onset marks
   * of `deep_onset: cap`), listed for labels and the README.
   */
  readonly optionalResults?: readonly ResultDef[];
  /** Optional: the result fields under a model section (absent: always `results`); see resultsOf */
  resultsFor?(model: ModelSpec): readonly ResultDef[];
  /**
   * Optional: the outputs a report draws by default, most telling first (those that hold no
   * values in a file are left out there). Absent: every result field.
   */
  readonly reportOutputs?: readonly string[];
  /** the statuses it can produce (a subset of COLUMN_STATUSES) */
  readonly statuses: readonly ColumnStatus[];
  readonly model: ProcessModelOptions;
  /** the runtime model of a validated model section */
  resolveModel(model: ModelSpec, options: ResolveOptions): M;
  /**
   * One scenario: pure, thread-safe, never throws (an exception is a `failed` row with the
   * reason). `inputs` holds every input of inputsFor(model) by name; the object may be reused
   * by the caller for the next row, so do not keep it.
   */
  compute(inputs: Readonly<Record<string, number>>, model: M): ProcessResult;
  /** the first line `meltsweep column` prints above the result table (absent: "process: NAME") */
  describeColumn?(inputs: Readonly<Record<string, number>>, model: M): string;
  /** fields of the profile arrays (column --profile, plot column); absent: no profiles */
  readonly profile?: readonly FieldInfo[];
  /**
   * Optional: sample a computed column onto a fixed pressure grid for the profile table
   * (`run --profiles`); absent: the process writes no profile table.
   */
  readonly profileTable?: ProfileTableSampler<M>;
  /**
   * Optional: the picture of a few scenarios of this process (`plot column --process NAME`, the
   * report's representative columns). A loader, so the plotting libraries load only when drawn.
   * Absent: decompression's column diagram for decompression, no picture for other processes.
   */
  readonly diagram?: () => Promise<ProcessDiagram<M>>;
}

/** One scenario of a process diagram: its inputs by name and an optional key label. */
export interface DiagramItem {
  readonly inputs: Readonly<Record<string, number>>;
  readonly label?: string;
}

/** A process's diagram (see ProcessDefinition.diagram). */
export interface ProcessDiagram<M> {
  /** the result field by which the report picks its representative scenarios (smallest, median, largest) */
  readonly representativeOutput: string;
  /** lay out the figure of up to MAX_DIAGRAM_SCENARIOS scenarios; notes: what could not be drawn */
  figure(
    items: readonly DiagramItem[],
    model: M,
    options: { readonly title?: string; readonly subtitle?: string | readonly string[] },
  ): { readonly layout: FigureLayout; readonly notes: readonly string[] };
}

/** Sampling of computed columns onto the profile-table grid (see src/run/profile-sampling.ts). */
export interface ProfileTableSampler<M> {
  /**
   * Write row `row` of `out` from one computed scenario (result computed with withProfile).
   * `pressuresGpa` ascending.
   */
  sample(
    result: ProcessResult,
    inputs: Readonly<Record<string, number>>,
    model: M,
    pressuresGpa: Float64Array,
    out: ProfileSamples,
    row: number,
  ): void;
}

/** A registered process with its runtime-model type erased (see defineProcess in registry.ts). */
export type AnyProcess = ProcessDefinition<unknown>;
