export * from './auth';
export * from './audit';
export * from './mail';
export * from './catalogue';
export * from './projects';
