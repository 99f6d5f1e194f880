import { BadRequestError } from "../errors";

/** An uploaded file's name as sent, refused when it carries folders, control characters or runs too long. */
export function plainFileName(name: string): string {
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
  if (/[/\\]|\.\.|[\u0000-\u001f]/.test(name) || name.length > 255) {
    throw new BadRequestError("The file name must be a plain name without folders.");
  }
  return name;
}
