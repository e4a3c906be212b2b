import type { RowProblem } from '../calibration';

/** Every API error has this body, whatever the status. */
export interface ApiErrorBody {
  error: {
    code: string;
    message: string;
    /** Field path (dot-joined) → message, for validation errors. */
    fields?: Record<string, string>;
    /** For seq conflicts of a drive: the seq the next batch must start at. */
    expectedSeq?: number;
    /** For `calibration_rows`: the rows of the upload to fix (at most FLEET_MAX_PROBLEMS). */
    details?: { problems: RowProblem[] };
  };
}
