import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { Chair } from './models/chair.model.js';
import { Location } from './models/location.model.js';
import { Microscope } from './models/microscope.model.js';
import { Practice } from './models/practice.model.js';
import { PracticesController } from './practices.controller.js';
import { PracticesService } from './practices.service.js';

@Module({
  imports: [SequelizeModule.forFeature([Practice, Location, Chair, Microscope])],
  controllers: [PracticesController],
  providers: [PracticesService],
  exports: [PracticesService],
})
export class PracticesModule {}
