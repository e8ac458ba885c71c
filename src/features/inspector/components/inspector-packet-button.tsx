import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { Button } from '@/components/ui/button';

/** Downloads the audit packet for the link's own date range (the server fixes the range). */
export function InspectorPacketButton() {
  const [received, setReceived] = useState(0);
  const download = useMutation({
    mutationFn: async () => {
      const { blob, headers } = await api.postForDownload('/api/inspector/audit-packet', {}, setReceived);
      const name = /filename="([^"]+)"/.exec(headers.get('Content-Disposition') ?? '')?.[1] ?? 'audit-packet.zip';
      const url = URL.createObjectURL(blob);
      const a = Object.assign(document.createElement('a'), { href: url, download: name });
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
    },
  });
  return (
    <div className="flex flex-col gap-1">
      <Button onClick={() => download.mutate()} isBusy={download.isPending}>Download the audit packet (zip)</Button>
      <p role="status" className="text-sm text-muted">
        {download.isPending ? `Preparing… ${Math.round(received / 1024)} KiB received` : download.isSuccess ? 'The packet is in your downloads.' : ''}
        {download.error ? <span className="text-cherry">{download.error.message}</span> : null}
      </p>
    </div>
  );
}
