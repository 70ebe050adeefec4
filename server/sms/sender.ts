// Outgoing texts through the SMS service's official Node SDK. Outside production the settings point
// the SDK's API domain at the local fake (server/sms/fake.ts); in production at the service itself.
import twilio from 'twilio';
import type { Config } from '../config';

export interface OutgoingText {
  to: string;
  body: string;
  /** Where the service reports delivery (our signed status webhook). */
  statusCallback?: string;
}

export interface TextSender {
  /** Sends one text; resolves with the service's message id, rejects with the service's refusal. */
  send(text: OutgoingText): Promise<{ sid: string }>;
}

/** A refusal worth trying again later (the service or the network was unwell, or it asked us to slow down). */
export function isPassingFailure(err: unknown): boolean {
  const status = (err as { status?: unknown } | null)?.status;
  return typeof status !== 'number' || status === 429 || status >= 500;
}

export function createTextSender(config: Pick<Config, 'sms'>): TextSender {
  const { credentials, apiUrl, from } = config.sms;
  if (!credentials) {
    return { send: () => Promise.reject(Object.assign(new Error('Text messages are not set up on this server (SMS_ACCOUNT_SID, SMS_AUTH_TOKEN)'), { status: 400 })) };
  }
  const client = twilio(credentials.accountSid, credentials.authToken, { timeout: 10_000 });
  // The SDK's own domain base URL: every request of the Api domain goes to this host instead.
  if (apiUrl) client.api.baseUrl = apiUrl;
  return {
    async send({ to, body, statusCallback }) {
      const message = await client.messages.create({ to, from, body, ...(statusCallback ? { statusCallback } : {}) });
      return { sid: message.sid };
    },
  };
}
