export function FieldError({ errors, id }: { errors?: string[]; id?: string }) {
  if (!errors?.length) return null;
  return (
    <p className="field-error" id={id} data-testid="field-error">
      {errors.join(" ")}
    </p>
  );
}
