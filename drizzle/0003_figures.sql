CREATE TABLE `figure` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`number` int NOT NULL,
	`title` varchar(300) NOT NULL,
	`caption` text NOT NULL,
	`template` varchar(60) NOT NULL,
	`computation_ids` json NOT NULL,
	`options` json NOT NULL,
	`created_by` varchar(40),
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `figure_id` PRIMARY KEY(`id`),
	CONSTRAINT `figure_number_unique` UNIQUE(`companion_id`,`number`)
);
--> statement-breakpoint
ALTER TABLE `figure` ADD CONSTRAINT `figure_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `figure` ADD CONSTRAINT `figure_created_by_user_id_fk` FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;