import { z } from "zod";
import { ROLES } from "../auth/roles";
import { optionalText } from "../common/lists.schemas";

export const RoleSchema = z.enum(ROLES);

export const LoginSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter an e-mail address."),
  password: z.string().min(1, "Enter your password."),
});
export type LoginInput = z.infer<typeof LoginSchema>;

export const PasswordSchema = z.string().min(10, "A password needs at least 10 characters.").max(200);

export const CreateUserSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter an e-mail address."),
  name: z.string().trim().min(1, "Enter the person's name.").max(120),
  role: RoleSchema,
  password: PasswordSchema,
  badgeCode: optionalText(64),
  certificateNumber: optionalText(64),
});
export type CreateUserInput = z.input<typeof CreateUserSchema>;

export const UpdateUserSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    role: RoleSchema,
    active: z.boolean(),
    badgeCode: z.string().trim().min(1).max(64).nullable(),
    certificateNumber: z.string().trim().min(1).max(64).nullable(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, "Change at least one field.");
export type UpdateUserInput = z.infer<typeof UpdateUserSchema>;

export const ResetPasswordSchema = z.object({ password: PasswordSchema });

export const UserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
});
export type User = z.infer<typeof UserSchema>;

export const UserDetailSchema = UserSchema.extend({
  active: z.boolean(),
  badgeCode: z.string().nullable(),
  certificateNumber: z.string().nullable(),
  createdAt: z.string(),
});
export type UserDetail = z.infer<typeof UserDetailSchema>;
