/**
 * A user's file could not be used. `code` is stable and dotted
 * (`audio.truncated`, `midi.no_kicks`); `status` is the HTTP status the
 * error middleware answers with: 400 malformed bytes, 413 too large,
 * 415 unsupported type or codec, 422 a valid file that cannot be used.
 * The message is one line, meant for the engineer who uploaded the file.
 */
export class AudioInputError extends Error {
  constructor(
    public code: string,
    public status: 400 | 413 | 415 | 422,
    message: string,
  ) {
    super(message);
    this.name = 'AudioInputError';
  }
}
