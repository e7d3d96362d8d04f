import { Link } from 'react-router-dom';
import { LogoMark } from '@/components/ui/logo';

export function Brand({ to = '/', subtitle }: { to?: string; subtitle?: string }) {
  return (
    <Link to={to} className="flex min-h-11 items-center gap-3 rounded-lg">
      <LogoMark />
      <span className="flex flex-col leading-tight">
        <span className="text-lg font-bold tracking-tight text-ink-950">Benchrelay</span>
        {subtitle ? <span className="text-sm text-ink-600">{subtitle}</span> : null}
      </span>
    </Link>
  );
}
