// Pipe: size catalogues (IPS, CTS, ISO metric), wall and fusion area, bend radius.
export * from '@/domain/pipe/catalogue';
export * from '@/domain/pipe/geometry';
export * from '@/domain/pipe/walls';
export * from '@/domain/pipe/bending';
