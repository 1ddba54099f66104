// Qualifications: fuser qualification status under 49 CFR 192.285(c), and ISO civil dates
// (domain/dates, re-exported here under their public names).
export * from '@/domain/dates/civil';
export * from '@/domain/qualifications/status';
