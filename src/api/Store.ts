import { createRequire } from 'node:module';
import type { ColumnTable } from 'arquero';
import type * as Flechette from '@uwdata/flechette';
import type { Manifest } from '../store/Manifest.js';
import type { RowTable } from '../store/RowTable.js';
import { rowsToArrow, STORE_COLUMNS } from '../store/rowsArrow.js';

/** The arquero module (loaded by openStore: importing it costs a fifth of a second, which the CLI never pays). */
export type Arquero = typeof import('arquero');

const requireHere = createRequire(import.meta.url);
let flechette: typeof Flechette | null = null;
const fl = (): typeof Flechette => (flechette ??= requireHere('@uwdata/flechette') as typeof Flechette);

/** A store opened for scripting: its rows (typed arrays), its manifest, and views for other tools. */
export class Store {
  /** The store directory. */
  readonly dir: string;
  readonly manifest: Manifest;
  /** The canonical rows as typed-array columns (what every analysis reads). */
  readonly table: RowTable;
  readonly #aq: Arquero;

  constructor(opts: { dir: string; manifest: Manifest; table: RowTable; arquero: Arquero }) {
    this.dir = opts.dir;
    this.manifest = opts.manifest;
    this.table = opts.table;
    this.#aq = opts.arquero;
  }

  /** Rows in the store (one per run and logged epoch). */
  get rows(): number {
    return this.table.length;
  }

  /** The rows as Arrow IPC file bytes, laid out as rows.arrow (text columns dictionary-encoded). */
  toArrowIPC(): Uint8Array {
    return rowsToArrow(this.table)!;
  }

  /** The rows as an Arrow table (flechette's, the Arrow library arquero itself reads). */
  toArrow(): Flechette.Table {
    return fl().tableFromIPC(this.toArrowIPC(), { useBigInt: false });
  }

  /**
   * The rows as an arquero table: one row per logged row, the canonical columns in store order
   * (run, seed, width, epochs, train_size, label_noise, condition, test_error, train_error,
   * test_loss, train_loss, wall_seconds, status, source, source_line), then any extra numeric
   * columns. Number columns are the store's own Float64Arrays, shared rather than copied
   * (arquero verbs make new tables and never write to their input).
   */
  toArquero(): ColumnTable {
    const t = this.table;
    const columns: Record<string, ArrayLike<unknown>> = {};
    for (const c of STORE_COLUMNS) columns[c] = t[c];
    for (const [name, col] of Object.entries(t.extra)) if (!(name in columns)) columns[name] = col;
    return this.#aq.table(columns);
  }
}
