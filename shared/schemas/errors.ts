/** Every API error has this body, whatever the status. */
export interface ApiErrorBody {
  error: {
    code: string;
    message: string;
    /** Field path (dot-joined) → message, for validation errors. */
    fields?: Record<string, string>;
    /** For seq conflicts of a drive: the seq the next batch must start at. */
    expectedSeq?: number;
  };
}
