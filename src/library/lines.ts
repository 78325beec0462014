/**
 * Splits a byte stream into text lines, failing (rather than ending early) when the stream fails
 * or grows past `limitBytes`, so that an import never mistakes a cut-off upload for a whole one.
 */
import { StringDecoder } from 'node:string_decoder';
import { LibraryError } from './errors.ts';

export async function* linesOf(stream: AsyncIterable<Buffer | string>, limitBytes = Infinity): AsyncGenerator<string> {
  const decoder = new StringDecoder('utf8');
  let seen = 0;
  let rest = '';
  for await (const chunk of stream) {
    const buf = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
    seen += buf.length;
    if (seen > limitBytes) {
      throw new LibraryError(`The import is larger than ${Math.round(limitBytes / 2 ** 20)} MiB; split it into smaller files.`, 'too-large');
    }
    rest += decoder.write(buf);
    let start = 0;
    let nl = rest.indexOf('\n', start);
    while (nl >= 0) {
      yield rest.slice(start, nl);
      start = nl + 1;
      nl = rest.indexOf('\n', start);
    }
    rest = rest.slice(start);
  }
  rest += decoder.end();
  if (rest.length) yield rest;
}
