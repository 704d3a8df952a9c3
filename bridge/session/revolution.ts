/**
 * The antenna's revolution period from its recorded pointing, for the default replay step.
 * A clockwise antenna's azimuth wraps from near 2π to near 0 once a turn; the median interval
 * between the first wraps ignores a missed or doubled sample.
 */

export class RevolutionEstimate {
  private last: number | null = null;
  private wraps: number[] = [];
  add(timeS: number, azimuthRad: number): void {
    if (this.wraps.length > 40) return;
    if (this.last !== null && this.last > 1.5 * Math.PI && azimuthRad < 0.5 * Math.PI) this.wraps.push(timeS);
    this.last = azimuthRad;
  }
  periodS(): number | null {
    const d = this.wraps.slice(1).map((t, i) => t - this.wraps[i]).sort((a, b) => a - b);
    return d.length ? d[d.length >> 1] : null;
  }
}
