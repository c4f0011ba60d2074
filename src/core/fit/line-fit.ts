/** Ordinary least-squares line y = intercept + slope·x with the slope's standard error. */
export interface LineFit {
  slope: number;
  intercept: number;
  slopeStandardError: number;
  residualRms: number;
  count: number;
}

/** Fits the points of (x, y) listed in `indices`; null with fewer than 3 points. */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>, indices: ArrayLike<number>): LineFit | null {
  const n = indices.length;
  if (n < 3) return null;
  let sx = 0;
  let sy = 0;
  for (let j = 0; j < n; j++) {
    sx += x[indices[j]];
    sy += y[indices[j]];
  }
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let j = 0; j < n; j++) {
    const dx = x[indices[j]] - mx;
    sxx += dx * dx;
    sxy += dx * (y[indices[j]] - my);
  }
  if (sxx === 0) return null;
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let sse = 0;
  for (let j = 0; j < n; j++) {
    const i = indices[j];
    sse += (y[i] - intercept - slope * x[i]) ** 2;
  }
  const variance = sse / (n - 2);
  return {
    slope,
    intercept,
    slopeStandardError: Math.sqrt(variance / sxx),
    residualRms: Math.sqrt(variance),
    count: n,
  };
}
