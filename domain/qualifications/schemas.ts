// Input schemas of the Qualifications form (49 CFR 192.285): a passed qualification and a
// failed attempt, used by the form and parsed again on the server.
import { z } from 'zod';
import { requiredText, requiredDate, idField, optionalIdField } from '@/domain/form-fields';

export const QUALIFICATION_METHODS = ['visual-bend', 'visual-tensile', 'ultrasonic'] as const;
export type QualificationMethod = (typeof QUALIFICATION_METHODS)[number];

/** Words for each §192.285(b) specimen test. */
export const QUALIFICATION_METHOD_LABELS: Record<QualificationMethod, string> = {
  'visual-bend': 'Visual examination and bend test (at least 3 longitudinal straps)',
  'visual-tensile': 'Visual examination and tensile test',
  ultrasonic: 'Ultrasonic inspection',
};

export const recordQualificationSchema = z.object({
  userId: idField('Person'),
  procedureId: idField('Procedure'),
  qualifiedOn: requiredDate('Qualification date'),
  method: z.enum(QUALIFICATION_METHODS, { error: 'Choose the test method (visual plus bend, visual plus tensile, or ultrasonic).' }),
  specimenResult: requiredText("Specimen joint's result", 3, 300),
  evaluator: requiredText('Evaluator', 2, 160),
});
export type RecordQualificationInput = z.output<typeof recordQualificationSchema>;

export const recordQualificationFailureSchema = z.object({
  userId: idField('Person'),
  procedureId: idField('Procedure'),
  failedOn: requiredDate('Date the joint failed its test'),
  jointId: optionalIdField('Joint number'),
  notes: requiredText('What was found', 3, 500),
});
export type RecordQualificationFailureInput = z.output<typeof recordQualificationFailureSchema>;
