// Joint references: the forms the app itself prints (the Trace and Review screens' "WO-24152
// joint 10", the Register's Job and Joint columns side by side, a joint tag's QR address made
// by domain/labels jointLabelUrl), the forms people write, and bad inputs with clear messages.
import { describe, expect, test } from 'vitest';
import { formatJointReference, parseJointReference } from '@/domain/joints/reference';
import { jointLabelUrl } from '@/domain/labels/label';

const jobJoint = (jobCode: string, jointNo: number) => ({ ok: true, reference: { kind: 'job-joint', jobCode, jointNo } });

describe('parseJointReference: the forms Beadline prints', () => {
  test.each([
    // The Trace screen's "Joint" cell and the Review queue print `${jobCode} joint ${jointNo}`
    // (app/(signed-in)/trace/page.tsx, review-queue.tsx): the demo jobs WO-24117 and WO-24152.
    ['WO-24152 joint 10', 'WO-24152', 10],
    ['WO-24117 joint 1', 'WO-24117', 1],
    // The Register's Job column then its Joint column, as copied from the grid (tab between cells).
    ['WO-24152\t10', 'WO-24152', 10],
    // A joint tag's file name (domain/labels jointLabelText name "joint-WO-24152-10") without its prefix.
    ['WO-24152-10', 'WO-24152', 10],
  ])('%j → job %s, joint %i', (text, jobCode, jointNo) => {
    expect(parseJointReference(text)).toEqual(jobJoint(jobCode, jointNo));
  });

  test('formatJointReference prints what the parser reads back', () => {
    // The Trace screen's text for joint 10 of WO-24152, typed out here as a person reads it.
    expect(formatJointReference({ jobCode: 'WO-24152', jointNo: 10 })).toBe('WO-24152 joint 10');
    expect(parseJointReference(formatJointReference({ jobCode: 'LM/2026/07', jointNo: 4 }))).toEqual(jobJoint('LM/2026/07', 4));
  });

  test.each([
    // jointLabelUrl (domain/labels) builds the QR address; the expected id is the one put in.
    ['https://beadline.larkmoor-gas.example', 4711],
    ['http://127.0.0.1:3100', 1],
    ['https://records.larkmoor-gas.example/beadline/', 123456789012],
  ])('a joint tag made on %s for joint id %i reads back as that id', (base, id) => {
    expect(parseJointReference(jointLabelUrl(base, id))).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: id } });
  });

  test('the address as a scanner may send it: query, fragment, trailing slash, no scheme, the joint page path', () => {
    // source: WHATWG URL Standard — the path ends at "?" (query) or "#" (fragment); checked with Node's URL below.
    const sent = 'https://beadline.larkmoor-gas.example/joints/88/?src=qr#top';
    expect(new URL(sent).pathname).toBe('/joints/88/');
    expect(parseJointReference(sent)).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: 88 } });
    expect(parseJointReference('beadline.larkmoor-gas.example/joints/88')).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: 88 } });
    expect(parseJointReference('/joints/88')).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: 88 } });
    expect(parseJointReference('/trace/joints/88')).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: 88 } });
    expect(parseJointReference('  HTTPS://BEADLINE.LARKMOOR-GAS.EXAMPLE/joints/88  ')).toEqual({ ok: true, reference: { kind: 'joint-id', jointId: 88 } });
  });
});

describe('parseJointReference: the forms people write', () => {
  test.each([
    ['WO-24152 #10', 'WO-24152', 10],
    ['WO-24152#10', 'WO-24152', 10],
    ['WO-24152/10', 'WO-24152', 10],
    ['WO-24152 / 10', 'WO-24152', 10],
    ['WO-24152 10', 'WO-24152', 10],
    ['wo-24152 JOINT 10', 'wo-24152', 10],
    ['WO-24152 joint #10', 'WO-24152', 10],
    ['WO-24152 joint no. 10', 'WO-24152', 10],
    ['WO-24152   joint   10', 'WO-24152', 10],
    ['WO-24152 joint 007', 'WO-24152', 7],
    // Job codes may hold slashes and hyphens (the Jobs form allows . _ / -): the last one splits.
    ['LM/2026/07/12', 'LM/2026/07', 12],
    ['LM/2026/07 joint 12', 'LM/2026/07', 12],
    ['LM-2026-07-12', 'LM-2026-07', 12],
  ])('%j → job %s, joint %i', (text, jobCode, jointNo) => {
    expect(parseJointReference(text)).toEqual(jobJoint(jobCode, jointNo));
  });

  test.each([
    ['12', 12],
    ['#12', 12],
    ['# 12', 12],
  ])('digits alone (%j) are a number the caller reads as an id or a joint number', (text, value) => {
    expect(parseJointReference(text)).toEqual({ ok: true, reference: { kind: 'number', value } });
  });
});

describe('parseJointReference: bad inputs say what is wrong', () => {
  const message = (text: string) => {
    const out = parseJointReference(text);
    if (out.ok) throw new Error(`expected a refusal for ${JSON.stringify(text)}`);
    return out.message;
  };

  test.each([
    ['', /^Enter a joint\. Give the job code and joint number \(e\.g\. WO-24152 joint 10\)/],
    ['   ', /^Enter a joint\./],
    ['joint 10', /^Say which job the joint is on, e\.g\. WO-24152 joint 10\.$/],
    ['#', /is not a joint reference/],
    ['LV-C0004', /^"LV-C0004" has no joint number: add it, e\.g\. LV-C0004 joint 10\.$/],
    ['WO-24152 joint', /^"WO-24152 joint" has no joint number: add it, e\.g\. WO-24152 joint 10\.$/],
    ['WO-24152 joint 0', /^Joint numbers start at 1\.$/],
    ['0', /^Joint numbers and ids start at 1\.$/],
    ['WO-24152 joint 1234567890', /^Joint number 1234567890 is too long \(9 digits at most\)\.$/],
    ['1234567890123456', /too long to be a joint number or id/],
    ['Larkmoor main joint 4', /^"Larkmoor main" is not a job code: job codes hold letters, digits and \. _ \/ - only, with no spaces\./],
    ['WO-24152 joint 10a', /^"WO-24152 joint 10a" is not a joint reference\./],
    ['https://beadline.larkmoor-gas.example/coils/LV-C0004', /^That is a coil label's address \(coil LV-C0004\), not a joint tag's\./],
    ['https://beadline.larkmoor-gas.example/joints/abc', /^The address ends in "\/joints\/abc", which holds no joint id\./],
    ['https://beadline.larkmoor-gas.example/joints/', /which holds no joint id/],
    ['https://beadline.larkmoor-gas.example/register?q=12', /^That address is not a joint tag's/],
    ['x'.repeat(301), /too long to name a joint \(300 characters at most\)/],
  ])('%j', (text, expected) => {
    expect(message(text)).toMatch(expected);
  });

  test('a job code alone with a hyphen is read as job and number, so the caller can say how it was read', () => {
    // common practice (no published source): "WO-24152" is both a job code and "WO" + joint 24152; the hyphen form is kept because people write it
    expect(parseJointReference('WO-24152')).toEqual(jobJoint('WO', 24152));
  });

  test('a percent-encoded coil id in a coil label address is decoded in the message', () => {
    // source: RFC 3986 §2.1 — "%2F" is "/" percent-encoded
    expect(message('https://beadline.larkmoor-gas.example/coils/LV%2FC7')).toContain('(coil LV/C7)');
  });
});
