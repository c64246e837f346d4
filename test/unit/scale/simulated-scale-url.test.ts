import { describe, expect, it } from 'vitest';
import { simulatedScaleUrl } from '@/features/scale/scale.server';

describe('whether the ticket screen offers the simulated scale', () => {
  it('is off unless CUPEL_SIMULATED_SCALE_URL is set', () => {
    expect(simulatedScaleUrl({})).toBeNull();
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: '' })).toBeNull();
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: '   ' })).toBeNull();
  });

  it('takes a loopback address only, as its origin', () => {
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'http://127.0.0.1:12122' })).toBe('http://127.0.0.1:12122');
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'http://localhost:12112/stream' })).toBe('http://localhost:12112');
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'http://scale.example.com:12112' })).toBeNull();
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'http://10.0.0.5:12112' })).toBeNull();
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'file:///etc/passwd' })).toBeNull();
    expect(simulatedScaleUrl({ CUPEL_SIMULATED_SCALE_URL: 'not a url' })).toBeNull();
  });
});
