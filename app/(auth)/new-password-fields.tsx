import { describedBy, Field, Input } from "@/components/ui/field";
import { PASSWORD_MIN_LENGTH } from "@/lib/validations/auth";

export interface NewPasswordFieldsProps {
  errors?: Record<string, string[]>;
}

/** "New password" and "Repeat it", shared by the reset and invitation forms. */
export function NewPasswordFields({ errors }: NewPasswordFieldsProps) {
  return (
    <>
      <Field id="password" label="New password" hint={`At least ${PASSWORD_MIN_LENGTH} characters; a passphrase of a few words works well.`} errors={errors?.password}>
        <Input
          id="password"
          name="password"
          type="password"
          autoComplete="new-password"
          required
          minLength={PASSWORD_MIN_LENGTH}
          aria-describedby={describedBy("password")}
          aria-invalid={Boolean(errors?.password)}
        />
      </Field>
      <Field id="confirm" label="Repeat the password" errors={errors?.confirm}>
        <Input
          id="confirm"
          name="confirm"
          type="password"
          autoComplete="new-password"
          required
          aria-describedby={describedBy("confirm")}
          aria-invalid={Boolean(errors?.confirm)}
        />
      </Field>
    </>
  );
}
