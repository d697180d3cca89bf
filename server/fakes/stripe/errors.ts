/** The error types this stand-in answers with; the SDK picks its error class from `type` and the status. */
export type FakeErrorType = "invalid_request_error" | "idempotency_error" | "card_error" | "api_error";

export interface FakeErrorBody {
  error: { type: FakeErrorType; message: string; param?: string; code?: string };
}

/** Thrown by the operations; the routes turn it into the `{ error: … }` answer with its status. */
export class StripeFakeError extends Error {
  override name = "StripeFakeError";

  constructor(
    readonly status: number,
    readonly type: FakeErrorType,
    message: string,
    readonly param?: string,
    readonly code?: string,
  ) {
    super(message);
  }

  toBody(): FakeErrorBody {
    const error: FakeErrorBody["error"] = { type: this.type, message: this.message };
    if (this.param !== undefined) error.param = this.param;
    if (this.code !== undefined) error.code = this.code;
    return { error };
  }
}

/** 400 invalid_request_error naming the parameter at fault. */
export function invalidParam(param: string, message: string, code?: string): StripeFakeError {
  return new StripeFakeError(400, "invalid_request_error", message, param, code);
}

/** 404 resource_missing: unknown here, or created with another secret key. */
export function resourceMissing(objectName: string, id: string, param = "id"): StripeFakeError {
  return new StripeFakeError(404, "invalid_request_error", `No such ${objectName}: '${id}'`, param, "resource_missing");
}

export function invalidApiKey(): StripeFakeError {
  return new StripeFakeError(401, "invalid_request_error", "Invalid API Key provided");
}
