/** A logger file that cannot be used, with a plain message that says what is wrong and where. */
export class LoggerFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "LoggerFileError";
  }
}
