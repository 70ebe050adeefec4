// Development and test fake of the hosted SMS service: the part of its REST API the SDK calls to send
// a text (POST /2010-04-01/Accounts/{sid}/Messages.json, form fields in, JSON out), a line per text in
// texts.jsonl of the outbox folder, a status callback after each text, and inbound replies (STOP)
// posted, signed as the service signs them, to the app's webhook. Started by scripts/tasks.ts and
// the tests only: never imported by the server itself. Field names and codes are the service's as
// recalled from memory of its documentation (no copy of it at hand).
import { appendFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import express from 'express';
import twilio from 'twilio';
import type { Config } from '../config';
import { TEXTS_FILE, type FakeTextRecord } from './outbox';

export interface SmsFakeOptions {
  port: number;
  outboxDir: string;
  accountSid: string;
  authToken: string;
  /** The app's inbound webhook (replies such as STOP are posted here, signed). */
  inboundUrl: string;
}

export interface SmsFake {
  port: number;
  /** The next `times` texts to `to` are refused with HTTP `status` (a 5xx: the service is unwell). */
  failNext(to: string, times: number, status?: number): void;
  /** A reply from `from` reaches the app's inbound webhook; resolves with the app's HTTP status. */
  reply(from: string, body: string): Promise<number>;
  close(): Promise<void>;
}

const E164 = /^\+[1-9][0-9]{6,14}$/;
const sid = (prefix: string) => `${prefix}${randomBytes(16).toString('hex')}`;

/** Posts form fields signed with the account's token, as the service does with its webhooks. */
async function postSigned(url: string, authToken: string, params: Record<string, string>): Promise<number> {
  const signature = twilio.getExpectedTwilioSignature(authToken, url, params);
  const res = await fetch(url, { method: 'POST', headers: { 'Content-Type': 'application/x-www-form-urlencoded', [twilio.SIGNATURE_HEADER]: signature }, body: new URLSearchParams(params) });
  return res.status;
}

/** Starts the fake; resolves once it listens. */
export async function startSmsFake(opts: SmsFakeOptions): Promise<SmsFake> {
  mkdirSync(opts.outboxDir, { recursive: true });
  const failures = new Map<string, { times: number; status: number }>();
  const app = express();
  app.use(express.urlencoded({ extended: false, limit: '64kb' }));
  app.use(express.json({ limit: '64kb' }));
  const refuse = (res: express.Response, status: number, code: number, message: string) =>
    res.status(status).json({ code, message, more_info: '', status });

  app.post('/2010-04-01/Accounts/:sid/Messages.json', (req, res) => {
    const auth = Buffer.from(String(req.headers.authorization ?? '').replace(/^Basic /, ''), 'base64').toString('utf8');
    if (req.params.sid !== opts.accountSid || auth !== `${opts.accountSid}:${opts.authToken}`) return refuse(res, 401, 20003, 'Authenticate');
    const { To: to = '', From: from = '', Body: body = '', StatusCallback: statusCallback } = req.body as Record<string, string | undefined>;
    if (!E164.test(to)) return refuse(res, 400, 21211, `The 'To' number ${to} is not a valid phone number.`);
    if (!body) return refuse(res, 400, 21602, 'Message body is required.');
    const failing = failures.get(to);
    if (failing && failing.times > 0) {
      failing.times--;
      return refuse(res, failing.status, 20500, 'Internal Server Error');
    }
    const now = new Date();
    const record: FakeTextRecord = { sid: sid('SM'), to, from, body, date: now.toISOString() };
    appendFileSync(join(opts.outboxDir, TEXTS_FILE), `${JSON.stringify(record)}\n`);
    res.status(201).json({
      sid: record.sid, account_sid: opts.accountSid, to, from, body, status: 'queued', direction: 'outbound-api',
      num_segments: String(Math.max(1, Math.ceil(body.length / 153))), num_media: '0', price: null, price_unit: 'USD',
      error_code: null, error_message: null, api_version: '2010-04-01', date_created: now.toUTCString(), date_updated: now.toUTCString(), date_sent: null,
      messaging_service_sid: null, uri: `/2010-04-01/Accounts/${opts.accountSid}/Messages/${record.sid}.json`, subresource_uris: {},
    });
    if (statusCallback) {
      void postSigned(statusCallback, opts.authToken, { MessageSid: record.sid, MessageStatus: 'delivered', AccountSid: opts.accountSid, To: to, From: from }).catch(() => undefined);
    }
  });

  const reply = (from: string, body: string) =>
    postSigned(opts.inboundUrl, opts.authToken, { MessageSid: sid('SM'), AccountSid: opts.accountSid, From: from, To: '', Body: body, NumMedia: '0' });
  // Controls for a person trying it by hand or a browser test in another process.
  app.post('/fake/replies', async (req, res) => {
    const { From: from = '', Body: body = '' } = req.body as Record<string, string | undefined>;
    if (!E164.test(from)) return refuse(res, 400, 21211, `The 'From' number ${from} is not a valid phone number.`);
    res.json({ appStatus: await reply(from, body) });
  });

  const server = app.listen(opts.port, '127.0.0.1');
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.once('listening', () => resolve());
  });
  return {
    port: (server.address() as AddressInfo).port,
    failNext: (to, times, status = 503) => void failures.set(to, { times, status }),
    reply,
    close: () => new Promise<void>((r) => server.close(() => r())),
  };
}

/** Starts the fake the settings point at (outside production); in production, or with no fake host set, nothing. */
export async function startSmsFakeFor(config: Config): Promise<{ close(): Promise<void> }> {
  const { apiUrl, credentials } = config.sms;
  if (config.env === 'production' || !apiUrl || !credentials) return { close: async () => undefined };
  const url = new URL(apiUrl);
  if (url.hostname !== '127.0.0.1' && url.hostname !== 'localhost') return { close: async () => undefined };
  return startSmsFake({ port: Number(url.port) || 80, outboxDir: config.outboxDir, ...credentials, inboundUrl: `${config.publicUrl}/api/texts/inbound` });
}
