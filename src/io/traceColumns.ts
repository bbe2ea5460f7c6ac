/**
 * Growable columns (abscissa, ordinate, 1-based source line) filled while a parser reads a file.
 * Capacity doubles, so memory follows the data actually read, never a count claimed by the file.
 */
export class TraceColumnBuilder {
  length = 0;
  private xs: Float64Array;
  private ys: Float64Array;
  private ls: Int32Array;

  /** @param initialCapacity first allocation, in points (clamped to [16, 1 << 20]) */
  constructor(initialCapacity = 1024) {
    const cap = Math.min(1 << 20, Math.max(16, Math.floor(initialCapacity)));
    this.xs = new Float64Array(cap);
    this.ys = new Float64Array(cap);
    this.ls = new Int32Array(cap);
  }

  /** Append one point: abscissa and ordinate in file units, `line` 1-based. */
  push(x: number, y: number, line: number): void {
    if (this.length === this.xs.length) this.grow();
    this.xs[this.length] = x;
    this.ys[this.length] = y;
    this.ls[this.length] = line;
    this.length++;
  }

  private grow(): void {
    const cap = this.xs.length * 2;
    const xs = new Float64Array(cap);
    const ys = new Float64Array(cap);
    const ls = new Int32Array(cap);
    xs.set(this.xs);
    ys.set(this.ys);
    ls.set(this.ls);
    this.xs = xs;
    this.ys = ys;
    this.ls = ls;
  }

  /** Exact-length copies (own buffers, so they can be transferred to another thread). */
  finish(): { x: Float64Array; y: Float64Array; lines: Int32Array } {
    return { x: this.xs.slice(0, this.length), y: this.ys.slice(0, this.length), lines: this.ls.slice(0, this.length) };
  }
}
