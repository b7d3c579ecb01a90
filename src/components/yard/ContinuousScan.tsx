import ScanInput, { type Identified } from '@/components/yard/ScanInput';

/**
 * Scanning bin after bin with the camera kept open (a load going on, a run coming off), with the cautions for
 * handling them and the deferral to local rules underneath.
 */
export default function ContinuousScan({
  prefixLength,
  onIdentified,
  busy,
  label,
  cautions,
  defer,
}: {
  prefixLength: number;
  onIdentified: (bin: Identified) => void | Promise<void>;
  busy: boolean;
  label: string;
  cautions: readonly string[];
  defer: string;
}) {
  return (
    <div className="card p-4">
      <ScanInput prefixLength={prefixLength} onIdentified={onIdentified} busy={busy} keepCameraOpen label={label} />
      <div className="notice-attention mt-3 text-sm">
        {cautions.map((c) => (
          <p key={c}>{c}</p>
        ))}
        <p className="mt-1 text-xs">{defer}</p>
      </div>
    </div>
  );
}
