// The mail catcher as the start command runs it (maildev 3.0.0): which address opens its inbox,
// and that it listens on loopback only.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import net, { type AddressInfo } from 'node:net';
import { networkInterfaces } from 'node:os';
import { mailInboxUrl, startMaildev, type Service } from './services';

let maildev: Service | undefined;
after(async () => {
  await maildev?.stop();
});

async function freePort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

test('the printed inbox address opens the inbox in a browser; maildev listens on loopback only', { timeout: 90_000 }, async () => {
  const [smtp, web] = [await freePort(), await freePort()];
  maildev = await startMaildev(smtp, web, { quiet: true });
  assert.equal(maildev.startedHere, true);

  const url = await mailInboxUrl(web);
  assert.equal(url, `http://127.0.0.1:${web}/`);
  // What a browser's address bar asks for: the inbox page.
  const page = await fetch(url, { headers: { Accept: 'text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8' } });
  assert.equal(page.status, 200);
  assert.match(page.headers.get('content-type') ?? '', /^text\/html/);
  assert.match(await page.text(), /<title>[^<]*MailDev/i);
  // What curl or a script asks for at the same address: not the inbox (why a quick check misleads).
  const bare = await fetch(url, { headers: { Accept: '*/*' } });
  assert.equal(bare.status, 404);
  // The REST API beside it.
  assert.deepEqual(await (await fetch(`http://127.0.0.1:${web}/api/email`)).json(), []);

  // Not reachable from the network: every other IPv4 address of this machine is refused.
  const outside = Object.values(networkInterfaces()).flat().filter((a) => a && a.family === 'IPv4' && !a.internal);
  for (const a of outside) {
    await assert.rejects(fetch(`http://${a!.address}:${web}/api/healthz`, { signal: AbortSignal.timeout(3000) }), `${a!.address} must not answer`);
  }
});
