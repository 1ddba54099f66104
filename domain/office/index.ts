// Office set-up: jobs, equipment, procedures and qualifications — schemas and pure rules.
export * from '@/domain/office/dates';
export * from '@/domain/office/rules';
export * from '@/domain/office/schemas';
export * from '@/domain/office/procedures';
export * from '@/domain/office/qualifications';
