import type { APIRoute } from 'astro';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { SETTING_DEFINITIONS } from '@/features/settings/settings';
import { getStoreSettings, setStoreSetting } from '@/features/settings/settings.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, params.storeId);
  const values = await getStoreSettings(getDb(), storeId);
  const definitions = Object.fromEntries(
    Object.entries(SETTING_DEFINITIONS).map(([k, d]) => [k, { type: d.type, label: d.label, help: d.help, default: d.default }]),
  );
  return json({ storeId, values, definitions });
});

const changeSchema = z.object({ key: z.string().min(1, 'key is required'), value: z.unknown() });

export const PUT: APIRoute = handle(async ({ locals, params, request }) => {
  const user = requireRole(locals, 'managers');
  const storeId = storeScope(user, params.storeId);
  const { key, value } = await parseJsonBody(request, changeSchema);
  await setStoreSetting(getDb(), user, storeId, key, value);
  return json({ storeId, values: await getStoreSettings(getDb(), storeId) });
});
