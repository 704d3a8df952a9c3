// kalman-filter (npm) is CommonJS and ships no types. Used only as an outside reference in tests
// and in the baseline benchmark; the shapes below cover what the project calls.
declare module 'kalman-filter' {
  export interface KalmanState {
    mean: number[][];
    covariance: number[][];
    index?: number;
  }
  export class State implements KalmanState {
    constructor(args: { mean: number[][]; covariance: number[][]; index?: number });
    mean: number[][];
    covariance: number[][];
    index?: number;
  }
  export class KalmanFilter {
    constructor(options: Record<string, unknown>);
    predict(args?: { previousCorrected?: KalmanState; index?: number }): State;
    correct(args: { predicted: KalmanState; observation: number[] | number[][] }): State;
    filter(args: { previousCorrected?: KalmanState; observation: number[] | number[][] }): State;
    filterAll(observations: number[][]): number[][];
  }
  const kf: { KalmanFilter: typeof KalmanFilter; State: typeof State };
  export default kf;
}
