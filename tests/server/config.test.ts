import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('configuration from the environment', () => {
  it('starts with defaults on loopback when nothing is set', () => {
    const config = loadConfig({});
    expect(config.HOST).toBe('127.0.0.1');
    expect(config.PORT).toBe(4380);
    expect(config.PF_EXTERNAL_SERVICES).toBe(false);
  });

  it('rejects bad values with ONE line that names every bad variable', () => {
    let message = '';
    try {
      loadConfig({ PORT: 'eighty', LOG_LEVEL: 'chatty', PF_EXTERNAL_SERVICES: 'maybe' });
    } catch (err) {
      message = (err as Error).message;
    }
    expect(message).toMatch(/^Invalid configuration: /);
    expect(message).not.toContain('\n');
    for (const name of ['PORT', 'LOG_LEVEL', 'PF_EXTERNAL_SERVICES']) expect(message).toContain(name);
  });

  it('reads PF_EXTERNAL_SERVICES=1 as true', () => {
    expect(loadConfig({ PF_EXTERNAL_SERVICES: '1' }).PF_EXTERNAL_SERVICES).toBe(true);
  });
});
