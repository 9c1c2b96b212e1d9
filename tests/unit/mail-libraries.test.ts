/**
 * The mail libraries Tacklog depends on work together on this Node (20.x): nodemailer 10 sends
 * over SMTP on loopback to smtp-server, and mailparser reads back what arrived. This guards the
 * dependency upgrades (nodemailer 7 → 10); the alerting and digest code has its own tests.
 */
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';

const received: ParsedMail[] = [];
let server: SMTPServer;
let port = 0;

beforeAll(async () => {
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream).then(
        (mail) => {
          received.push(mail);
          callback();
        },
        (err: Error) => callback(err),
      );
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  port = (server.server.address() as AddressInfo).port;
});

afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

describe('mail libraries on this Node', () => {
  it('runs on the Node version the project supports', () => {
    expect(Number(process.versions.node.split('.')[0])).toBeGreaterThanOrEqual(20);
  });

  it('nodemailer sends a message with non-ASCII text that smtp-server receives and mailparser reads', async () => {
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
    const info = await transport.sendMail({
      from: 'Tacklog <tacklog@plant.test>',
      to: 'purchasing@plant.test',
      subject: 'Lot R-2041 expires in 3 days — 2 containers',
      text: 'Resin lot R-2041: use before 2026-12-05 (FEFO). Temperatur 23 °C.',
    });
    transport.close();
    expect(info.accepted).toEqual(['purchasing@plant.test']);
    const mail = received.find((m) => m.messageId === info.messageId);
    expect(mail?.subject).toBe('Lot R-2041 expires in 3 days — 2 containers');
    expect(mail?.text?.trim()).toBe('Resin lot R-2041: use before 2026-12-05 (FEFO). Temperatur 23 °C.');
    expect(mail?.from?.value[0]).toMatchObject({ address: 'tacklog@plant.test', name: 'Tacklog' });
  });
});
