// @ts-check
import { defineConfig, envField } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), auth()],
  server: { host: '127.0.0.1', port: Number(process.env.APP_PORT ?? 4321) },
  // Form posts from another origin are refused (Astro's CSRF check for on-demand pages).
  // allowedDomains: the Host names Cupel trusts when it builds request URLs (and so the origin check).
  security: {
    checkOrigin: true,
    allowedDomains: [
      { hostname: '127.0.0.1' },
      { hostname: 'localhost' },
      ...(process.env.CUPEL_PUBLIC_HOSTNAME ? [{ hostname: process.env.CUPEL_PUBLIC_HOSTNAME, protocol: 'https' }] : []),
    ],
  },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ['bcryptjs', 'postgres'] },
  },
  env: {
    validateSecrets: false,
    schema: {
      DATABASE_URL: envField.string({ context: 'server', access: 'secret' }),
      AUTH_SECRET: envField.string({ context: 'server', access: 'secret' }),
      SMTP_HOST: envField.string({ context: 'server', access: 'secret', default: '127.0.0.1' }),
      SMTP_PORT: envField.number({ context: 'server', access: 'secret', default: 1025 }),
      MAIL_FROM: envField.string({ context: 'server', access: 'secret', default: 'Cupel <receipts@cupel.invalid>' }),
    },
  },
});
