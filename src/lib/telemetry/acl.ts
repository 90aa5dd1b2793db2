// Who may do what on the broker. Pure, so the rules are tested without a broker; the aedes broker
// applies them, and docs/wire-contract.md gives the equivalent Mosquitto ACL.
import { SERIAL_PATTERN, parseTopic } from './wire';

export type Principal = { kind: 'service' } | { kind: 'device'; serial: string };

/** A device's client id must start with its serial, so it can never take over another client's session (e.g. the ingest worker's). */
export function clientIdAllowed(p: Principal, clientId: string): boolean {
  if (p.kind === 'service') return clientId.startsWith('heatlayer-');
  return clientId === p.serial || clientId.startsWith(`${p.serial}-`);
}

export function mayPublish(p: Principal, topic: string): boolean {
  if (p.kind === 'service') return topic.startsWith('heatlayer/v1/');
  const t = parseTopic(topic);
  return (
    t !== null &&
    t.serial === p.serial &&
    (t.channel === 'telemetry' || t.channel === 'status' || t.channel === 'replies')
  );
}

export function maySubscribe(p: Principal, filter: string): boolean {
  if (p.kind === 'service') return filter.startsWith('heatlayer/v1/');
  const t = parseTopic(filter);
  return t !== null && t.serial === p.serial && t.channel === 'commands';
}

export const looksLikeSerial = (username: string): boolean => SERIAL_PATTERN.test(username);
