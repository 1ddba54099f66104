// Units: SI <-> US customary conversion (NIST SP 811 factors) and display formatting.
export * from '@/domain/units/conversions';
export * from '@/domain/units/format';
