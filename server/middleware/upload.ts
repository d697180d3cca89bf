import type { RequestHandler } from "express";
import multer from "multer";
import { AppError } from "../errors.js";
import { checkImage, type ImagePolicy } from "../images.js";

/** What singleFile() was set up with, kept on the handler so tests can find every upload route. */
export interface UploadSpec {
  field: string;
  maxBytes: number;
  what: string;
  image: ImagePolicy | null;
}

/**
 * Reads one multipart file field into memory (multer), with every multer or busboy failure turned
 * into our error shape: over the size limit → 413, anything malformed → 400 naming the field. With an
 * image policy (the logo's by default), the file is also checked as an image before the route sees it.
 */
export function singleFile(field: string, maxBytes: number, what: string, image: ImagePolicy | null = null): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // Browsers send file names as UTF-8; multer's default reads them as latin1.
    defParamCharset: "utf8",
    limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 64 * 1024, parts: 12 },
  }).single(field);
  const limitText = maxBytes >= 1024 * 1024 ? `${maxBytes / (1024 * 1024)} MB` : `${Math.round(maxBytes / 1024)} KB`;
  const handler: RequestHandler = (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) {
        try {
          if (image && req.file) checkImage(req.file.buffer, image, field);
        } catch (refused) {
          return next(refused);
        }
        return next();
      }
      const code = (error as { code?: unknown }).code;
      if (code === "LIMIT_FILE_SIZE") return next(new AppError("payload_too_large", `${field}: the ${what} is larger than the limit of ${limitText}`, { field }));
      if (code === "LIMIT_UNEXPECTED_FILE" || code === "LIMIT_FILE_COUNT") {
        return next(new AppError("invalid_input", `${field}: send exactly one ${what} in the multipart field "${field}"`, { field }));
      }
      if (typeof code === "string" && code.startsWith("LIMIT_")) return next(new AppError("invalid_input", `The upload has too many or too large form fields`, { field }));
      next(new AppError("invalid_input", `${field}: the upload could not be read (send it as multipart/form-data)`, { field }));
    });
  };
  const spec: UploadSpec = { field, maxBytes, what, image };
  return Object.assign(handler, { upload: spec });
}
