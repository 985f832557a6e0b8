import { ApiProperty } from '@nestjs/swagger';
import type { LoginRequest } from '@ostium/shared';
import { Transform } from 'class-transformer';
import { IsNotEmpty, IsString, MaxLength } from 'class-validator';

export class LoginDto implements LoginRequest {
  @ApiProperty({ example: 'frontdesk@quillfern-endo.test' })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim().toLowerCase() : value))
  @IsString({ message: 'email must be a string' })
  @IsNotEmpty({ message: 'email must not be empty' })
  @MaxLength(254)
  email: string;

  @ApiProperty() @IsString({ message: 'password must be a string' }) @IsNotEmpty({ message: 'password must not be empty' }) @MaxLength(200) password: string;
}
