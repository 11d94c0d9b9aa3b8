/** The one error shape every API route answers with. */
export interface ApiErrorBody {
  error: {
    code: string;
    message: string;
    details?: unknown;
  };
}

/** Field errors as sent in `details.fields` for validation failures: path -> messages. */
export type FieldErrors = Record<string, string[]>;
