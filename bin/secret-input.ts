// Reading a secret (a password) without putting it on the command line, where `ps` and
// /proc/<pid>/cmdline show it to every user of the machine.

/** The first line of standard input, without its line ending (`printf '%s\n' "$PW" | osmia … --password-stdin`). */
export async function readSecretFromStdin(stream: NodeJS.ReadableStream = process.stdin): Promise<string> {
  const chunks: Buffer[] = [];
  let length = 0;
  for await (const chunk of stream) {
    const buf = typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer);
    chunks.push(buf);
    length += buf.length;
    // A password is one short line: stop reading at its end, or once far more than any password came.
    if (buf.includes(0x0a) || length > 64 * 1024) break;
  }
  const text = Buffer.concat(chunks).toString('utf8');
  const end = text.search(/\r?\n/);
  return end === -1 ? text : text.slice(0, end);
}

/**
 * Ask on the terminal with echo off: the characters typed are not shown. Backspace deletes, Enter
 * ends, Ctrl-C and Ctrl-D abandon (rejects). Only for a TTY on standard input.
 */
export function promptSecret(question: string, input: NodeJS.ReadStream = process.stdin, output: NodeJS.WriteStream = process.stderr): Promise<string> {
  return new Promise((resolve, reject) => {
    output.write(question);
    const wasRaw = input.isRaw;
    input.setRawMode(true);
    input.resume();
    let value = '';
    const finish = (err?: Error) => {
      input.setRawMode(wasRaw);
      input.pause();
      input.off('data', onData);
      output.write('\n');
      if (err) reject(err);
      else resolve(value);
    };
    const onData = (data: Buffer) => {
      for (const ch of data.toString('utf8')) {
        if (ch === '\r' || ch === '\n') return finish();
        if (ch === '\u0003' || ch === '\u0004') return finish(new Error('no password given'));
        if (ch === '\u007f' || ch === '\b') value = value.slice(0, -1);
        else value += ch;
      }
    };
    input.on('data', onData);
  });
}
