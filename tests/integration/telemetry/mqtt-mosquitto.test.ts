// The same ingest contract against Debian's Mosquitto (its own password file and ACL standing in
// for our broker's authentication), with the same ingest worker code run in this process.
import { execFileSync, spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, chownSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createConnection } from 'node:net';
import { join } from 'node:path';
import { getPool, closeDb } from '../../../src/db';
import { SERVICE_USERNAME } from '../../../src/lib/telemetry/device-token';
import { IngestWorker } from '../../../src/lib/telemetry/ingest-worker.server';
import { describeBrokerContract } from './broker-contract';
import { portInBlock } from './helpers';

const MOSQUITTO = '/usr/sbin/mosquitto';
const SERVICE_PASSWORD = 'mosquitto-test-service-password';

describeBrokerContract('Mosquitto', 160, async () => {
  const port = portInBlock(24);
  // Started as root, Mosquitto drops to its own user before it reads the password and ACL files, and
  // that user may not reach into the checkout (a private folder): they go in a folder of its own
  // under /tmp, owned by the broker's user and readable by it alone.
  const dir = mkdtempSync(join('/tmp', `heatlayer-mosquitto-${port}-`));
  const brokerUser =
    process.getuid?.() === 0
      ? {
          uid: Number(execFileSync('id', ['-u', 'mosquitto'], { encoding: 'utf8' })),
          gid: Number(execFileSync('id', ['-g', 'mosquitto'], { encoding: 'utf8' })),
        }
      : null;
  const handToBroker = () => {
    chmodSync(dir, 0o700);
    for (const name of readdirSync(dir)) chmodSync(join(dir, name), 0o600);
    if (brokerUser)
      for (const p of [dir, ...readdirSync(dir).map((n) => join(dir, n))]) chownSync(p, brokerUser.uid, brokerUser.gid);
  };
  const passwd = join(dir, 'passwd');
  const addUser = (user: string, password: string) => {
    const r = spawnSync(
      'mosquitto_passwd',
      ['-b', ...(spawnSync('test', ['-e', passwd]).status === 0 ? [] : ['-c']), passwd, user, password],
      { encoding: 'utf8' },
    );
    if (r.status !== 0) throw new Error(`mosquitto_passwd failed: ${r.stderr}`);
    handToBroker();
  };
  addUser(SERVICE_USERNAME, SERVICE_PASSWORD);
  // The equivalent of src/lib/telemetry/acl.ts for Mosquitto (%u is the username, i.e. the serial).
  writeFileSync(
    join(dir, 'acl'),
    [
      `user ${SERVICE_USERNAME}`,
      'topic readwrite heatlayer/v1/#',
      '',
      'pattern write heatlayer/v1/tanks/%u/telemetry',
      'pattern write heatlayer/v1/tanks/%u/status',
      'pattern write heatlayer/v1/tanks/%u/replies',
      'pattern read heatlayer/v1/tanks/%u/commands',
      '',
    ].join('\n'),
  );
  const conf = join(dir, 'mosquitto.conf');
  const writeConf = () =>
    writeFileSync(
      conf,
      [
        `listener ${port} 127.0.0.1`,
        'allow_anonymous false',
        `password_file ${passwd}`,
        `acl_file ${join(dir, 'acl')}`,
        'persistence false',
        'max_inflight_messages 1000',
        'max_queued_messages 100000',
        'log_dest stdout',
        'log_type error',
        'log_type warning',
        '',
      ].join('\n'),
    );
  writeConf();
  handToBroker();
  let proc: ChildProcess | null = null;
  const run = async () => {
    proc = spawn(MOSQUITTO, ['-c', conf], { stdio: ['ignore', 'inherit', 'inherit'] });
    for (let i = 0; i < 100; i++) {
      const up = await new Promise<boolean>((resolve) => {
        const s = createConnection({ host: '127.0.0.1', port });
        s.once('connect', () => {
          s.end();
          resolve(true);
        });
        s.once('error', () => resolve(false));
      });
      if (up) return;
      await new Promise((r) => setTimeout(r, 100));
    }
    throw new Error(`Mosquitto did not start on port ${port}.`);
  };
  await run();
  const url = `mqtt://127.0.0.1:${port}`;
  const worker = new IngestWorker({
    mqttUrl: url,
    username: SERVICE_USERNAME,
    password: SERVICE_PASSWORD,
    pool: getPool(),
    retentionDays: 90,
    clientId: 'heatlayer-ingest-mosquitto',
    log: () => undefined,
  });
  const ready = new Promise<void>((resolve) => worker.once('ready', () => resolve()));
  worker.start();
  await ready;
  return {
    url,
    servicePassword: SERVICE_PASSWORD,
    async addDevice(tank) {
      addUser(tank.serial, tank.token);
      proc?.kill('SIGHUP'); // Mosquitto re-reads its password file on SIGHUP
      await new Promise((r) => setTimeout(r, 300));
    },
    async stop() {
      await worker.stop();
      await closeDb();
      proc?.kill('SIGTERM');
      rmSync(dir, { recursive: true, force: true });
    },
  };
});
