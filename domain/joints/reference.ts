// How people name one joint, read from one text: the job code and the joint's number within
// the job, as Beadline prints it ("WO-24152 joint 10") or as people write it ("WO-24152 #10",
// "WO-24152/10", "WO-24152 10", "WO-24152-10"), or the address a joint tag's QR code opens
// (`<base>/joints/<joint id>`, domain/labels/label.ts jointLabelUrl). One parser for every
// box where a joint is searched (Trace → origins, the Register's search); what a bare number
// means (a joint id or a joint number) is the caller's choice. The address is read by the
// WHATWG URL Standard's parts (scheme://host, then path, then ?query and #fragment).
import { JOB_CODE_PATTERN } from '@/domain/jobs/schemas';

export type JointReference =
  /** A job code and the joint's number within that job (joint numbers start at 1). */
  | { kind: 'job-joint'; jobCode: string; jointNo: number }
  /** A joint's own id, from a joint tag's address. */
  | { kind: 'joint-id'; jointId: number }
  /** Digits alone ("12", "#12"): a joint id or a joint number, as the caller reads it. */
  | { kind: 'number'; value: number };

export type JointReferenceResult = { ok: true; reference: JointReference } | { ok: false; message: string };

/** The example every message shows. */
export const JOINT_REFERENCE_EXAMPLE = 'WO-24152 joint 10';

/** A joint as Beadline prints it: "WO-24152 joint 10". */
export function formatJointReference(joint: { jobCode: string; jointNo: number }): string {
  return `${joint.jobCode} joint ${joint.jointNo}`;
}

/** Longest text read (a long QR address fits; anything longer is not a reference). */
const MAX_LENGTH = 300;
/** Joint numbers are stored as unsigned integers; 9 digits keeps every one readable. */
const MAX_JOINT_NO_DIGITS = 9;
/** Joint ids are at most 15 digits (below 2^53, so a JavaScript number holds them exactly). */
const MAX_ID_DIGITS = 15;
const MAX_JOB_CODE_LENGTH = 40;

const HOW = `Give the job code and joint number (e.g. ${JOINT_REFERENCE_EXAMPLE}), or scan the joint tag.`;

const fail = (message: string): JointReferenceResult => ({ ok: false, message });
const ok = (reference: JointReference): JointReferenceResult => ({ ok: true, reference });

/** scheme://host (RFC 3986 §3.1 scheme), a host with a dot before a known path, or a bare path. */
const SCHEME_AND_HOST = /^[a-z][a-z0-9+.-]*:\/\/[^/?#]*/i;
const BARE_HOST = /^[^\s/]+\.[^\s/]+(?::\d+)?(?=\/(?:[^\s]*\/)?(?:joints|coils)\/)/i;

function readAddress(text: string): JointReferenceResult | null {
  let rest: string;
  if (SCHEME_AND_HOST.test(text)) rest = text.replace(SCHEME_AND_HOST, '');
  else if (BARE_HOST.test(text)) rest = text.replace(BARE_HOST, '');
  else if (text.startsWith('/')) rest = text;
  else return null;
  const path = rest.split(/[?#]/)[0] ?? '';
  const joint = /\/joints\/([^/]*)\/?$/.exec(path);
  if (joint) {
    const segment = joint[1] ?? '';
    if (!/^\d+$/.test(segment)) return fail(`The address ends in "/joints/${segment}", which holds no joint id. A joint tag's address ends in /joints/ and a number.`);
    if (segment.length > MAX_ID_DIGITS) return fail(`The joint id in the address (${segment}) is too long to be a joint's.`);
    const jointId = Number(segment);
    if (jointId < 1) return fail('The joint id in the address is 0; joint ids start at 1.');
    return ok({ kind: 'joint-id', jointId });
  }
  const coil = /\/coils\/([^/]+)\/?$/.exec(path);
  if (coil) {
    let code = coil[1] ?? '';
    try {
      code = decodeURIComponent(code);
    } catch {
      // keep the raw segment
    }
    return fail(`That is a coil label's address (coil ${code}), not a joint tag's. Trace a coil under Lot → ground.`);
  }
  return fail(`That address is not a joint tag's: a joint tag opens an address ending in /joints/ and a number. ${HOW}`);
}

function jobJoint(jobText: string, numberText: string): JointReferenceResult {
  const jobCode = jobText.trim();
  if (!jobCode) return fail(`Say which job the joint is on, e.g. ${JOINT_REFERENCE_EXAMPLE}.`);
  if (!JOB_CODE_PATTERN.test(jobCode)) return fail(`"${jobCode}" is not a job code: job codes hold letters, digits and . _ / - only, with no spaces. ${HOW}`);
  if (jobCode.length > MAX_JOB_CODE_LENGTH) return fail(`"${jobCode.slice(0, 20)}…" is too long for a job code (${MAX_JOB_CODE_LENGTH} characters at most).`);
  if (numberText.length > MAX_JOINT_NO_DIGITS) return fail(`Joint number ${numberText} is too long (${MAX_JOINT_NO_DIGITS} digits at most).`);
  const jointNo = Number(numberText);
  if (jointNo < 1) return fail('Joint numbers start at 1.');
  return ok({ kind: 'job-joint', jobCode, jointNo });
}

/** "joint", "joint no.", "joint number", "joint #" between the job code and the number. */
const JOINT_WORD = String.raw`joints?\s*(?:no\.?|number|#)?`;

/**
 * Reads one joint reference. Input: what a person typed or a scanner sent. Output: the
 * reference, or a message saying what is wrong and how to write it. Spaces around the text
 * and repeated spaces inside it are ignored; the word "joint" in any letter case.
 */
export function parseJointReference(input: string): JointReferenceResult {
  const text = (input ?? '').trim().replace(/\s+/g, ' ');
  if (!text) return fail(`Enter a joint. ${HOW}`);
  if (text.length > MAX_LENGTH) return fail(`That text is too long to name a joint (${MAX_LENGTH} characters at most). ${HOW}`);

  const address = readAddress(text);
  if (address) return address;

  const digits = /^#? ?(\d+)$/.exec(text);
  if (digits) {
    const value = digits[1] ?? '';
    if (value.length > MAX_ID_DIGITS) return fail(`${value} is too long to be a joint number or id.`);
    if (Number(value) < 1) return fail('Joint numbers and ids start at 1.');
    return ok({ kind: 'number', value: Number(value) });
  }
  if (new RegExp(String.raw`^${JOINT_WORD} ?\d+$`, 'i').test(text)) return fail(`Say which job the joint is on, e.g. ${JOINT_REFERENCE_EXAMPLE}.`);

  const patterns: RegExp[] = [
    new RegExp(String.raw`^(.+?) ${JOINT_WORD} ?(\d+)$`, 'i'), // WO-24152 joint 10
    /^(.+?) ?# ?(\d+)$/, // WO-24152 #10
    /^(.+?) ?\/ ?(\d+)$/, // WO-24152/10 (the last slash: job codes may hold slashes)
    /^(\S+) (\d+)$/, // WO-24152 10
    /^(.+)-(\d+)$/, // WO-24152-10 (the last hyphen)
  ];
  for (const pattern of patterns) {
    const m = pattern.exec(text);
    if (m) return jobJoint(m[1] ?? '', m[2] ?? '');
  }

  const withoutWord = text.replace(new RegExp(String.raw` ?${JOINT_WORD}$`, 'i'), '');
  if (JOB_CODE_PATTERN.test(withoutWord)) return fail(`"${text}" has no joint number: add it, e.g. ${withoutWord} joint 10.`);
  return fail(`"${text.length > 40 ? `${text.slice(0, 40)}…` : text}" is not a joint reference. ${HOW}`);
}
