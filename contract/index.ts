export * from './api'
export { checkResponse, ContractViolation } from './check'
