/** The environment every test process uses: fast hashing, no .env surprises. */
export function testEnv(overrides: Record<string, string> = {}): NodeJS.ProcessEnv {
  return {
    ...process.env,
    NODE_ENV: 'test',
    BCRYPT_COST: '4',
    SESSION_SECRET: 'test-secret-that-is-long-enough-for-the-check',
    APP_URL: 'http://127.0.0.1:3999',
    DATABASE_URL: '',
    SMTP_URL: '',
    ...overrides,
  };
}
