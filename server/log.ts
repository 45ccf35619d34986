import pino from 'pino';

export function createLogger(level: string) {
  return pino({
    level,
    redact: {
      paths: ['password', '*.password', 'req.headers.cookie', 'req.headers.authorization', 'token', '*.token'],
      censor: '[redacted]',
    },
  });
}
