import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { ROLES, type CreateUserRequest, type Role, type UpdateUserRequest } from '@ostium/shared';
import { Transform } from 'class-transformer';
import { IsBoolean, IsEmail, IsIn, IsNotEmpty, IsOptional, IsString, MaxLength, MinLength } from 'class-validator';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
const lower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);

export class CreateUserDto implements CreateUserRequest {
  @ApiProperty({ example: 'new.colleague@quillfern-endo.test' })
  @Transform(lower) @IsEmail({}, { message: 'email must be a valid e-mail address' }) @MaxLength(254) email: string;

  @ApiProperty() @Transform(trim) @IsString() @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(160) name: string;

  @ApiProperty({ enum: ROLES }) @IsIn(ROLES, { message: `role must be one of ${ROLES.join(', ')}` }) role: Role;

  @ApiProperty({ minLength: 10 }) @IsString() @MinLength(10, { message: 'password must be at least 10 characters' }) @MaxLength(200) password: string;
}

export class UpdateUserDto implements UpdateUserRequest {
  @ApiPropertyOptional() @IsOptional() @Transform(trim) @IsString() @IsNotEmpty({ message: 'name must not be empty' }) @MaxLength(160) name?: string;

  @ApiPropertyOptional({ enum: ROLES }) @IsOptional() @IsIn(ROLES, { message: `role must be one of ${ROLES.join(', ')}` }) role?: Role;

  @ApiPropertyOptional() @IsOptional() @IsBoolean({ message: 'active must be true or false' }) active?: boolean;

  @ApiPropertyOptional({ minLength: 10 }) @IsOptional() @IsString() @MinLength(10, { message: 'password must be at least 10 characters' }) @MaxLength(200) password?: string;
}
