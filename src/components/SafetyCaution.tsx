import { FaultIcon } from './icons';

/** The standing caution shown on every screen. */
export function SafetyCaution({ onDark = false, className = '' }: { onDark?: boolean; className?: string }) {
  return (
    <p className={`flex items-start gap-2 text-xs leading-4 ${onDark ? 'text-graphite-300' : 'text-graphite-600'} ${className}`}>
      <FaultIcon size={16} className={`mt-px shrink-0 ${onDark ? 'text-copper-300' : 'text-caution-600'}`} />
      <span>
        <span className={`font-semibold ${onDark ? 'text-graphite-100' : 'text-graphite-800'}`}>Caution:</span> battery banks can deliver thousands of amperes into a
        short. Designs here inform the work; they are not approval to install. Follow local electrical codes and licensed
        practice.
      </span>
    </p>
  );
}
