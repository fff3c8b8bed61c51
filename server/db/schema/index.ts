export * from './auth';
export * from './company';
export * from './customers';
export * from './equipment';
export * from './plans';
export * from './technicians';
export * from './users';
export * from './visits';
