// Qualifications: fuser qualification status under 49 CFR 192.285(c), and ISO civil dates.
export * from '@/domain/qualifications/dates';
export * from '@/domain/qualifications/status';
