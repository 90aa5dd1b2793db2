// The schema, split by domain. Each domain file exports its tables and their row types.
export * from './auth';
export * from './companies';
export * from './homes';
export * from './accounts';
export * from './audit';
export * from './telemetry';
export * from './commissioning';
export * from './alerts';
export * from './energy';
