// Build-time settings of the web app. The API is served from the same origin under /api
// (the Vite dev server proxies it), so no absolute URL is needed by default.
export const env = {
  apiBaseUrl: (import.meta.env.VITE_API_BASE_URL as string | undefined) ?? '/api',
  appName: 'Plumbline',
} as const;
