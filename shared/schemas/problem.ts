/** An error as it leaves the server: RFC 7807 problem+json with a stable code. */
export interface Problem {
  type: string;
  title: string;
  status: number;
  code: string;
  detail?: string;
  /** The input field a validation error is about, as a dotted path. */
  field?: string;
  errors?: { field: string; message: string }[];
}
