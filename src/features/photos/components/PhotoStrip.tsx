import { useRef, useState } from 'react';
import useSWR from 'swr';
import { fetchJson, ApiError } from '@/lib/client/fetch-json';

interface Photo {
  id: string;
  kind: string;
  contentType: string;
  url?: string;
}

/** Photos of the seller's ID or of the ticket's items: taken with the counter camera or chosen from disk, kept private. */
export function PhotoStrip({ kind, ticketId, sellerId, label }: { kind: 'id-document' | 'item'; ticketId?: string; sellerId?: string; label: string }) {
  const query = ticketId ? `ticketId=${encodeURIComponent(ticketId)}` : `sellerId=${encodeURIComponent(sellerId ?? '')}`;
  const { data, mutate } = useSWR(`/api/photos?${query}`, (u: string) => fetchJson<{ photos: Photo[] }>(u));
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const photos = (data?.photos ?? []).filter((p) => p.kind === kind);

  async function upload(file: File) {
    setError(null);
    setBusy(true);
    const form = new FormData();
    form.set('file', file);
    form.set('kind', kind);
    if (ticketId) form.set('ticketId', ticketId);
    if (sellerId) form.set('sellerId', sellerId);
    try {
      const res = await fetch('/api/photos', { method: 'POST', body: form });
      if (!res.ok) {
        const body = (await res.json().catch(() => ({}))) as { error?: string };
        throw new ApiError(res.status, body.error ?? `Upload failed (${res.status})`);
      }
      await mutate();
    } catch (err) {
      setError(err instanceof Error ? err.message : String(err));
    } finally {
      setBusy(false);
      if (input.current) input.current.value = '';
    }
  }

  const inputId = `photo-${kind}-${ticketId ?? sellerId}`;
  return (
    <div>
      <label className="field-label" htmlFor={inputId}>
        {label}
      </label>
      <input
        id={inputId}
        ref={input}
        type="file"
        accept="image/jpeg,image/png,image/webp"
        capture="environment"
        className="mt-1 block text-sm"
        disabled={busy}
        onChange={(e) => {
          const f = e.target.files?.[0];
          if (f) void upload(f);
        }}
      />
      <p className="text-xs text-ink-600">JPEG, PNG or WebP, up to 10 MB. Kept private; only staff can open them.</p>
      {error && (
        <p role="alert" className="field-error">
          {error}
        </p>
      )}
      {photos.length > 0 && (
        <ul className="mt-2 flex flex-wrap gap-2" aria-label={`${label}: ${photos.length} stored`}>
          {photos.map((p) => (
            <li key={p.id}>
              <a href={`/api/photos/${p.id}`} target="_blank" rel="noreferrer">
                <img src={`/api/photos/${p.id}`} alt={kind === 'item' ? 'Item photo' : 'ID photo'} className="h-16 w-16 rounded border border-ink-200 object-cover" loading="lazy" />
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
