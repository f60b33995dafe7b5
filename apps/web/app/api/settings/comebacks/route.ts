// GET, PUT /api/settings/comebacks – the warranty window, review deadline, counted attributions and root cause list (owner)
import { comebackSettingsInput } from '~/lib/validators/comebacks';
import { route } from '~/server/api';
import { comebackSettingsView, saveComebackSettings } from '~/server/comebacks/settings';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'settings:manage' }, async () => comebackSettingsView());

export const PUT = route(
  { permission: 'settings:manage', body: comebackSettingsInput },
  async ({ principal, body }) => saveComebackSettings(principal, body),
);

export const { DELETE, PATCH, POST, OPTIONS } = otherMethods(['GET', 'PUT']);
