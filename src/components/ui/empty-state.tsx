export function EmptyState({
  title,
  children,
  action,
}: {
  title: string;
  children?: React.ReactNode;
  action?: React.ReactNode;
}) {
  return (
    <div className="card flex flex-col items-start gap-2 border-dashed px-5 py-6">
      <p className="text-sm font-semibold text-ink">{title}</p>
      {children ? <div className="max-w-prose text-sm text-ink-muted">{children}</div> : null}
      {action}
    </div>
  );
}
