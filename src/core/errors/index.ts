export { ERROR_CATALOGUE, ERROR_KINDS, errorKind, errorMessage, type ErrorCode, type ErrorKind, type ErrorParams } from './catalogue';
export { AppError, isAppError, type AppErrorArgs, type ErrorDetails } from './app-error';
